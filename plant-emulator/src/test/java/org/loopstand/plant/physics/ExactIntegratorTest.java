package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.assertj.core.api.Assertions.withinPercentage;

import org.hipparchus.ode.ODEState;
import org.hipparchus.ode.OrdinaryDifferentialEquation;
import org.hipparchus.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/**
 * The exact discretisation ({@link Integrator#EXACT}) against outside figures: Hipparchus Dormand–Prince 8(5,3) on
 * the independently written two-area model, the textbook steady states, and each block's matrix exponential
 * against the same reference integrator.
 */
class ExactIntegratorTest {
    private static final double LOAD_STEP_MW = 187.5;

    @Test
    void shouldFollowTheDormandPrinceTrajectoryOfTheLinearModel() {
        TwoAreaLinearModel model = new TwoAreaLinearModel();
        DormandPrince853Integrator reference = new DormandPrince853Integrator(1e-8, 1.0, 1e-12, 1e-12);
        OrdinaryDifferentialEquation ode = new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return 7;
            }

            @Override
            public double[] computeDerivatives(double t, double[] y) {
                return model.derivatives(y, LOAD_STEP_MW);
            }
        };
        double[] worstHzByStep = new double[2];
        double[] stepsS = {0.02, 0.05};
        double[] worstMw = new double[2];
        for (int i = 0; i < stepsS.length; i++) {
            GridSimulator sim = new GridSimulator(TextbookGrids.twoArea(), stepsS[i], 0, 0, Integrator.EXACT);
            sim.stepLoadMw("area1", LOAD_STEP_MW);
            double[] y = new double[7];
            double t = 0;
            for (int k = 1; k <= 60; k++) {
                double next = k * 0.5;
                y = reference.integrate(ode, new ODEState(t, y), next).getPrimaryState();
                t = next;
                sim.advanceTo(next);
                worstHzByStep[i] = Math.max(worstHzByStep[i], Math.abs(sim.frequencyHz("area1") - 60 - y[0]));
                worstHzByStep[i] = Math.max(worstHzByStep[i], Math.abs(sim.frequencyHz("area2") - 60 - y[1]));
                worstMw[i] = Math.max(worstMw[i], Math.abs(sim.tieFlowMw("tie12") - y[2]));
                worstMw[i] = Math.max(worstMw[i], Math.abs(sim.outputMw("gen1") - 500 - y[4]));
                worstMw[i] = Math.max(worstMw[i], Math.abs(sim.outputMw("gen2") - 500 - y[6]));
            }
        }
        System.out.printf("exact: worst %.3g Hz %.3g MW at 20 ms, %.3g Hz %.3g MW at 50 ms%n", worstHzByStep[0],
                worstMw[0], worstHzByStep[1], worstMw[1]);
        // Stated tolerance (docs/physics.md): the same as RK4's at the default step, 1e-6 Hz and 1e-4 MW over 30 s after
        // a 187.5 MW step, and no worse at the coarsest step the step rule accepts (50 ms).
        assertThat(worstHzByStep[0]).isLessThan(1e-6);
        assertThat(worstMw[0]).isLessThan(1e-4);
        assertThat(worstHzByStep[1]).isLessThan(1e-6);
        assertThat(worstMw[1]).isLessThan(1e-4);
    }

    @Test
    void shouldSettleSingleAreaAtMinusDeltaPOverDPlusOneOverR() {
        // Kundur, ch. 11; Saadat, ch. 12 (from memory): Δf_ss = −ΔP_L/(D + 1/R); 1/R = 1000 MW/0.05/50 Hz = 400 MW/Hz.
        var grid = TextbookGrids.singleArea(5, 20);
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, Integrator.EXACT);
        sim.stepLoadMw("solo", 100);
        sim.advanceTo(120);
        double expectedHz = -100.0 / (20.0 + 400.0);
        assertThat(sim.frequencyHz("solo") - 50.0).isCloseTo(expectedHz, withinPercentage(0.5));
        assertThat(sim.outputMw("g")).isCloseTo(600 + 400 * -expectedHz, withinPercentage(0.5));
    }

    @Test
    void shouldReproduceTheTwoAreaWorkedExample() {
        // Saadat, ch. 12 worked example (from memory), re-derived in TextbookSteadyStateTest: Δf = −0.3 Hz,
        // ΔP12 = −84.5 MW, ΔPm1 = 100 MW, ΔPm2 = 80 MW.
        var grid = TextbookGrids.twoArea();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, Integrator.EXACT);
        sim.stepLoadMw("area1", LOAD_STEP_MW);
        sim.advanceTo(150);
        assertThat(sim.frequencyHz("area1") - 60).isCloseTo(-0.3, withinPercentage(1));
        assertThat(sim.frequencyHz("area2") - 60).isCloseTo(-0.3, withinPercentage(1));
        assertThat(sim.tieFlowMw("tie12")).isCloseTo(-84.5, withinPercentage(1));
        assertThat(sim.outputMw("gen1") - 500).isCloseTo(100, withinPercentage(1));
        assertThat(sim.outputMw("gen2") - 500).isCloseTo(80, withinPercentage(1));
    }

    @Test
    void shouldMatchTheReferenceIntegratorForEachBlockExponential() {
        // A reheat-like block with a cubic input: x(h) = Φ·x0 + Σ Γ_j·w_j and ∫p·x ds, against DP853 on the same ODE.
        double[][] a = {{-5, 0, 0}, {3.3, -3.3, 0}, {0, 0.14, -0.14}};
        double[][] b = {{5}, {0}, {0}};
        double[] p = {0, 0.3, 0.7};
        double stepS = 0.05;
        BlockPropagator block = new BlockPropagator(a, b, p, stepS);
        double[] x0 = {100, 90, 80};
        double[] w = {110, -40, 300, -2000};
        OrdinaryDifferentialEquation ode = new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return 4;
            }

            @Override
            public double[] computeDerivatives(double s, double[] y) {
                double input = w[0] + w[1] * s + w[2] * s * s / 2 + w[3] * s * s * s / 6;
                double[] dy = new double[4];
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        dy[i] += a[i][j] * y[j];
                    }
                    dy[i] += b[i][0] * input;
                    dy[3] += p[i] * y[i];
                }
                return dy;
            }
        };
        double[] y0 = {x0[0], x0[1], x0[2], 0};
        double[] ref = new DormandPrince853Integrator(1e-10, 1.0, 1e-13, 1e-13)
                .integrate(ode, new ODEState(0, y0), stepS).getPrimaryState();
        double integral = 0;
        double end = 0;
        for (int j = 0; j < 3; j++) {
            integral += block.outIntegral[j] * x0[j];
            end += block.outEnd[j] * x0[j];
        }
        for (int i = 0; i < 3; i++) {
            double xi = 0;
            for (int j = 0; j < 3; j++) {
                xi += block.phi[i * 3 + j] * x0[j];
            }
            for (int k = 0; k < BlockPropagator.TERMS; k++) {
                xi += block.gamma[i * BlockPropagator.TERMS + k] * w[k];
            }
            assertThat(xi).as("state %d", i).isCloseTo(ref[i], within(1e-9));
        }
        for (int k = 0; k < BlockPropagator.TERMS; k++) {
            integral += block.outIntegralInput[k] * w[k];
            end += block.outEndInput[k] * w[k];
        }
        assertThat(integral).isCloseTo(ref[3], within(1e-9));
        assertThat(end).isCloseTo(p[0] * ref[0] + p[1] * ref[1] + p[2] * ref[2], within(1e-9));
    }
}
