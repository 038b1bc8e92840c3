package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.hipparchus.ode.ODEState;
import org.hipparchus.ode.OrdinaryDifferentialEquation;
import org.hipparchus.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/**
 * A block's exact step (matrix exponential of the augmented matrix) against Hipparchus Dormand–Prince 8(5,3) on the
 * same ODE. The exact integrator as a whole is checked with RK4's outside checks (ReferenceIntegratorTest,
 * TextbookSteadyStateTest, TieLineBiasControlTest, PowerBalanceTest, UnitLimitsPropertyTest run both).
 */
class BlockPropagatorTest {
    @Test
    void shouldMatchTheReferenceIntegratorForEachBlockExponential() {
        // A reheat-like block with a quintic input: x(h) = Φ·x0 + Σ Γ_j·w_j and ∫p·x ds, against DP853 on the same ODE.
        double[][] a = {{-5, 0, 0}, {3.3, -3.3, 0}, {0, 0.14, -0.14}};
        double[][] b = {{5}, {0}, {0}};
        double[] p = {0, 0.3, 0.7};
        double stepS = 0.05;
        BlockPropagator block = new BlockPropagator(a, b, p, stepS);
        double[] x0 = {100, 90, 80};
        double[] w = {110, -40, 300, -2000, 9000, -1.5e5};
        OrdinaryDifferentialEquation ode = new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return 4;
            }

            @Override
            public double[] computeDerivatives(double s, double[] y) {
                double input = w[0] + w[1] * s + w[2] * s * s / 2 + w[3] * s * s * s / 6 + w[4] * s * s * s * s / 24
                        + w[5] * s * s * s * s * s / 120;
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
        // the power's rate p·(A·x + B·w) at both ends, for the areas' curvature equations
        double inputEnd = 0;
        double term = 1;
        for (int k = 0; k < BlockPropagator.TERMS; k++) {
            inputEnd += w[k] * term;
            term *= stepS / (k + 1);
        }
        double rateStart = block.outSlopeInput[0] * w[0];
        double rateEnd = 0;
        double rateEndRef = 0;
        for (int j = 0; j < 3; j++) {
            rateStart += block.outSlope[j] * x0[j];
            rateEnd += block.outSlopeEnd[j] * x0[j];
        }
        for (int k = 0; k < BlockPropagator.TERMS; k++) {
            rateEnd += block.outSlopeEndInput[k] * w[k];
        }
        double rateStartRef = 0;
        for (int i = 0; i < 3; i++) {
            double dxStart = b[i][0] * w[0];
            double dxEnd = b[i][0] * inputEnd;
            for (int j = 0; j < 3; j++) {
                dxStart += a[i][j] * x0[j];
                dxEnd += a[i][j] * ref[j];
            }
            rateStartRef += p[i] * dxStart;
            rateEndRef += p[i] * dxEnd;
        }
        assertThat(rateStart).isCloseTo(rateStartRef, within(1e-9));
        assertThat(rateEnd).isCloseTo(rateEndRef, within(1e-7));
    }
}
