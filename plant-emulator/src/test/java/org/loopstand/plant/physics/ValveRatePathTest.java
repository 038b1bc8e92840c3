package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.hipparchus.ode.ODEState;
import org.hipparchus.ode.OrdinaryDifferentialEquation;
import org.hipparchus.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/**
 * The free valve rate's closed form against Hipparchus Dormand–Prince 8(5,3) run on the servo itself,
 * {@code dv/ds = g·(command(s) − v)}, with the rate {@code g·(command − v)} and its clamped integral read from that
 * run. The case: a command that rises fast and turns within the step, so the rate peaks inside the step above the
 * raise limit while both of its ends stay below it.
 */
class ValveRatePathTest {
    private static final double G_PER_S = 5;
    private static final double STEP_S = 0.02;
    private static final double COMMAND_MW = 200.09;
    private static final double VALVE_MW = 200;
    /** command'(0), command''(0): MW/s, MW/s² (command''' = 0) */
    private static final double COMMAND_1 = 4;
    private static final double COMMAND_2 = -400;
    private static final double RAISE_MW_PER_S = 0.5;
    private static final double LOWER_MW_PER_S = 1.0;

    @Test
    void shouldSeeTheRatePassTheLimitInsideTheStepThatBothEndsMiss() {
        ValveRatePath path = path();
        double[] ref = reference(RAISE_MW_PER_S);
        assertThat(path.rate(0)).isCloseTo(0.45, within(1e-12));
        assertThat(path.rate(STEP_S)).isCloseTo(ref[0], within(1e-9)).isLessThan(RAISE_MW_PER_S);
        // the reference run's own sampled peak: the limit is passed inside the step
        assertThat(ref[1]).isGreaterThan(0.52);
        assertThat(path.staysWithin(RAISE_MW_PER_S, LOWER_MW_PER_S)).isFalse();
        assertThat(path.staysWithin(ref[1] + 1e-6, LOWER_MW_PER_S)).isTrue();
    }

    @Test
    void shouldMoveTheValveAsTheFreeRateClampedToTheLimits() {
        ValveRatePath path = path();
        double[] ref = reference(RAISE_MW_PER_S);
        assertThat(path.clampedMoveMw(RAISE_MW_PER_S, LOWER_MW_PER_S)).isCloseTo(ref[2], within(1e-9))
                .isLessThan(ref[3]);
        // no limit reached: the free movement itself
        assertThat(path.clampedMoveMw(1.0, LOWER_MW_PER_S)).isCloseTo(ref[3], within(1e-9));
        // held for the whole step
        assertThat(path.clampedMoveMw(0.1, LOWER_MW_PER_S)).isCloseTo(0.1 * STEP_S, within(1e-15));
    }

    private static ValveRatePath path() {
        ValveRatePath path = new ValveRatePath();
        path.set(G_PER_S, STEP_S, Math.exp(-G_PER_S * STEP_S), G_PER_S * (COMMAND_MW - VALVE_MW),
                new double[] {0, COMMAND_1, COMMAND_2, 0, 0, 0}, 0, 0, 1);
        return path;
    }

    /** {rate at h, sampled peak rate, ∫ rate clamped to the raise limit, ∫ rate} from DP853 on the servo. */
    private static double[] reference(double raiseMwPerS) {
        OrdinaryDifferentialEquation servo = new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return 3;
            }

            @Override
            public double[] computeDerivatives(double s, double[] y) {
                double command = COMMAND_MW + COMMAND_1 * s + COMMAND_2 * s * s / 2;
                double rate = G_PER_S * (command - y[0]);
                return new double[] {rate, Math.min(raiseMwPerS, rate), rate};
            }
        };
        DormandPrince853Integrator dp853 = new DormandPrince853Integrator(1e-12, 1e-3, 1e-14, 1e-14);
        double[] y = {VALVE_MW, 0, 0};
        double peak = Double.NEGATIVE_INFINITY;
        int samples = 400;
        for (int i = 1; i <= samples; i++) {
            double from = STEP_S * (i - 1) / samples;
            double to = STEP_S * i / samples;
            y = dp853.integrate(servo, new ODEState(from, y), to).getPrimaryState();
            peak = Math.max(peak, G_PER_S * (COMMAND_MW + COMMAND_1 * to + COMMAND_2 * to * to / 2 - y[0]));
        }
        double end = COMMAND_MW + COMMAND_1 * STEP_S + COMMAND_2 * STEP_S * STEP_S / 2;
        return new double[] {G_PER_S * (end - y[0]), peak, y[1], y[2]};
    }
}
