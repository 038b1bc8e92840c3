package org.loopstand.plant.physics;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.grid.Turbine;

/**
 * Chooses and checks the fixed RK4 step from the fastest dynamics configured: the shortest time
 * constant τ (servos, turbine stages, half the water starting time, trip decay, hydro compensation)
 * and the fastest undamped swing between two areas {@code ω = √(2πT·(1/M_i + 1/M_j))}.
 *
 * <p>Accepted: {@code h ≤ τ/4} and {@code ω·h ≤ 0.5} (RK4 then stays well inside its stability region,
 * local error per step ≤ (0.5)^5/120 ≈ 3e-4 of the mode). Default: the largest of 50, 20, 10, 5, 2, 1,
 * 0.5, 0.2, 0.1 ms with {@code h ≤ 20 ms}, {@code h ≤ τ/10} and {@code ω·h ≤ 0.2}.
 *
 * <p>The exact discretisation ({@link Integrator#EXACT}) propagates the units' blocks by their matrix exponentials, so
 * τ sets no limit for it; its areas' coupling is A-stable but resolves the swing with a polynomial over the step, so
 * {@code ω·h ≤ 0.5} is kept for it.
 */
public final class StepSizeRule {
    private static final double[] LADDER_S = {0.05, 0.02, 0.01, 0.005, 0.002, 0.001, 0.0005, 0.0002, 0.0001};

    private final double fastestTimeConstantS;
    private final String fastestTimeConstantWhere;
    private final double fastestSwingRadPerS;
    private final String fastestSwingWhere;

    public StepSizeRule(Grid grid) {
        double tau = Double.POSITIVE_INFINITY;
        String where = "none";
        for (GeneratingUnit u : grid.units()) {
            if (!u.online()) {
                continue;
            }
            double[] candidates = {u.governorTimeConstantS(), u.turbine().fastestTimeConstantS(), u.tripTimeConstantS(),
                    hydroCompensationLagS(u)};
            String[] names = {"governor time constant", "turbine time constant", "trip time constant",
                    "transient droop lag"};
            for (int i = 0; i < candidates.length; i++) {
                if (candidates[i] > 0 && candidates[i] < tau) {
                    tau = candidates[i];
                    where = "unit " + u.id() + " " + names[i];
                }
            }
        }
        double omega = 0;
        String swing = "none";
        for (TieLine t : grid.ties()) {
            Area from = grid.areas().get(grid.areaIndex(t.fromArea()));
            Area to = grid.areas().get(grid.areaIndex(t.toArea()));
            double w = Math.sqrt(2 * Math.PI * t.synchronizingMwPerRad()
                    * (1 / from.inertiaMwSPerHz() + 1 / to.inertiaMwSPerHz()));
            if (w > omega) {
                omega = w;
                swing = "tie " + t.id();
            }
        }
        fastestTimeConstantS = tau;
        fastestTimeConstantWhere = where;
        fastestSwingRadPerS = omega;
        fastestSwingWhere = swing;
    }

    private static double hydroCompensationLagS(GeneratingUnit u) {
        if (u.turbine() instanceof Turbine.Hydro h) {
            return h.transientDroopPct() / u.droopPct() * h.resetTimeS();
        }
        return 0;
    }

    /** @return the largest step this rule accepts, s */
    public double maxAccurateStepS() {
        return Math.min(fastestTimeConstantS / 4.0, fastestSwingRadPerS > 0 ? 0.5 / fastestSwingRadPerS : Double.POSITIVE_INFINITY);
    }

    /** @return the default step for this grid, s */
    public double defaultStepS() {
        double limit = Math.min(0.02, Math.min(fastestTimeConstantS / 10.0,
                fastestSwingRadPerS > 0 ? 0.2 / fastestSwingRadPerS : Double.POSITIVE_INFINITY));
        for (double h : LADDER_S) {
            if (h <= limit * (1 + 1e-12)) {
                return h;
            }
        }
        return LADDER_S[LADDER_S.length - 1];
    }

    /** @return the largest step this rule accepts for the exact discretisation (the swing limit only), s */
    public double maxExactStepS() {
        return fastestSwingRadPerS > 0 ? 0.5 / fastestSwingRadPerS : Double.POSITIVE_INFINITY;
    }

    /** @throws IllegalArgumentException naming the fastest dynamics when {@code stepS} is too coarse for RK4 */
    public void check(double stepS) {
        check(stepS, Integrator.RK4);
    }

    /** @throws IllegalArgumentException naming the fastest dynamics when {@code stepS} is too coarse for the integrator */
    public void check(double stepS, Integrator integrator) {
        if (!(stepS > 0) || !Double.isFinite(stepS)) {
            throw new IllegalArgumentException("stepS must be a positive number of seconds, got " + stepS);
        }
        if (integrator == Integrator.EXACT) {
            if (stepS > maxExactStepS() * (1 + 1e-12)) {
                throw new IllegalArgumentException(String.format(java.util.Locale.ROOT,
                        "step %.6g s is too coarse for this site: the fastest inter-area swing is %.4g rad/s (%s); the "
                                + "exact integrator's step must be at most %.6g s (0.5/ω)",
                        stepS, fastestSwingRadPerS, fastestSwingWhere, maxExactStepS()));
            }
            return;
        }
        if (stepS > maxAccurateStepS() * (1 + 1e-12)) {
            throw new IllegalArgumentException(String.format(java.util.Locale.ROOT,
                    "step %.6g s is too coarse for this site: the fastest time constant is %.6g s (%s) and the "
                            + "fastest inter-area swing is %.4g rad/s (%s); the step must be at most %.6g s "
                            + "(τ/4 and 0.5/ω); the default for this site is %.6g s",
                    stepS, fastestTimeConstantS, fastestTimeConstantWhere, fastestSwingRadPerS, fastestSwingWhere,
                    maxAccurateStepS(), defaultStepS()));
        }
    }

    public double fastestTimeConstantS() {
        return fastestTimeConstantS;
    }

    public double fastestSwingRadPerS() {
        return fastestSwingRadPerS;
    }
}
