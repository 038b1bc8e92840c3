package org.loopstand.plant.physics;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

import org.hipparchus.complex.Complex;
import org.hipparchus.linear.EigenDecompositionNonSymmetric;
import org.hipparchus.linear.FieldVector;
import org.hipparchus.linear.MatrixUtils;
import org.loopstand.plant.grid.Grid;

/**
 * Small-signal screen of a site: the grid's right-hand side is differentiated numerically at the operating
 * point of t = 0 (nominal frequency, scheduled flows, units at their reference), and the eigenvalues of that
 * Jacobian decide whether the site may run. Governor dead bands count as open (no governor gain) because the
 * operating point sits inside them; rate and position limits do not act on a small disturbance.
 *
 * <p>Rules (docs/physics.md, "Stability screen"): any eigenvalue with real part above
 * {@link #UNSTABLE_REAL_PART_PER_S} refuses the site; an oscillatory mode with damping ratio below
 * {@link #MIN_DAMPING_RATIO} gives a warning. Sites with more than {@link #MAX_STATES} states are not screened
 * (the decomposition grows with the cube of the state count) and the report says so.
 */
public final class SmallSignalStability {
    /** Real part above which a mode counts as growing, 1/s (an e-folding time above 28 h is numerical noise). */
    public static final double UNSTABLE_REAL_PART_PER_S = 1e-5;
    /** Least damping ratio of an oscillatory mode without a warning (3 %, common practice, no source). */
    public static final double MIN_DAMPING_RATIO = 0.03;
    /** Largest state vector screened (areas + ties + 3 per unit). */
    public static final int MAX_STATES = 600;
    /** An area takes part in a mode when its frequency state's eigenvector magnitude is at least this share of the largest. */
    public static final double PARTICIPATION_SHARE = 0.3;
    private static final double OSCILLATORY_RAD_PER_S = 1e-6;

    /** What the screen decided. */
    public enum Verdict { STABLE, LIGHTLY_DAMPED, UNSTABLE, NOT_SCREENED }

    /**
     * One eigenvalue σ ± jω of the linearised grid.
     *
     * @param realPerS     σ, 1/s
     * @param imagRadPerS  ω ≥ 0, rad/s (0 for a non-oscillatory mode)
     * @param areas        areas taking part, largest first
     */
    public record Mode(double realPerS, double imagRadPerS, List<String> areas) {
        /** @return ω/2π, Hz */
        public double frequencyHz() {
            return imagRadPerS / (2 * Math.PI);
        }

        /** @return ζ = −σ/√(σ² + ω²), dimensionless, in [−1, 1] */
        public double dampingRatio() {
            return zeta(realPerS, imagRadPerS);
        }

        public String describe() {
            return String.format(Locale.ROOT, "%.3f Hz, damping ratio %.1f %%, eigenvalue %.4f ± %.4fj 1/s, areas %s",
                    frequencyHz(), 100 * dampingRatio(), realPerS, imagRadPerS, String.join(", ", areas));
        }
    }

    /**
     * @param worst       the mode with the largest real part (null when not screened)
     * @param leastDamped the oscillatory mode with the smallest damping ratio (null when none or not screened)
     */
    public record Report(Verdict verdict, Mode worst, Mode leastDamped, int stateCount) {
        public boolean refused() {
            return verdict == Verdict.UNSTABLE;
        }

        /** @return one line: the verdict and the mode it is about */
        public String describe() {
            return switch (verdict) {
                case UNSTABLE -> String.format(Locale.ROOT, "unstable: a mode grows (real part above %.0e 1/s): %s",
                        UNSTABLE_REAL_PART_PER_S, worst.describe());
                case LIGHTLY_DAMPED -> String.format(Locale.ROOT,
                        "lightly damped: least-damped mode below %.0f %% damping: %s", 100 * MIN_DAMPING_RATIO,
                        leastDamped.describe());
                case STABLE -> leastDamped == null ? "stable: no oscillatory mode"
                        : "stable: least-damped mode " + leastDamped.describe();
                case NOT_SCREENED -> "not screened: " + stateCount + " states, above the limit of " + MAX_STATES;
            };
        }
    }

    private SmallSignalStability() {
    }

    /** Screens the grid at its t = 0 operating point. */
    public static Report assess(Grid grid) {
        GridDynamics dynamics = new GridDynamics(grid, 0.0);
        if (dynamics.dimension() > MAX_STATES) {
            return new Report(Verdict.NOT_SCREENED, null, null, dynamics.dimension());
        }
        EigenDecompositionNonSymmetric eig = decompose(dynamics, dynamics.initialState());
        Complex[] values = eig.getEigenvalues();
        Mode worst = null;
        Mode leastDamped = null;
        for (int i = 0; i < values.length; i++) {
            Complex c = values[i];
            if (c.getImaginary() < -OSCILLATORY_RAD_PER_S) {
                continue; // its conjugate stands for the pair
            }
            boolean oscillatory = c.getImaginary() > OSCILLATORY_RAD_PER_S;
            double imag = oscillatory ? c.getImaginary() : 0.0;
            boolean larger = worst == null || c.getReal() > worst.realPerS();
            boolean lighter = oscillatory && (leastDamped == null
                    || zeta(c.getReal(), imag) < leastDamped.dampingRatio());
            if (larger || lighter) {
                Mode m = new Mode(c.getReal(), imag, participatingAreas(grid, eig.getEigenvector(i)));
                worst = larger ? m : worst;
                leastDamped = lighter ? m : leastDamped;
            }
        }
        Verdict verdict = worst != null && worst.realPerS() > UNSTABLE_REAL_PART_PER_S ? Verdict.UNSTABLE
                : leastDamped != null && leastDamped.dampingRatio() < MIN_DAMPING_RATIO ? Verdict.LIGHTLY_DAMPED
                : Verdict.STABLE;
        return new Report(verdict, worst, leastDamped, dynamics.dimension());
    }

    /** @return the eigenvalues of the simulator's right-hand side linearised at its present state */
    static Complex[] eigenvalues(GridSimulator sim) {
        return decompose(sim.dynamics(), sim.stateCopy()).getEigenvalues();
    }

    private static EigenDecompositionNonSymmetric decompose(GridDynamics dynamics, double[] x0) {
        int n = dynamics.dimension();
        double[] fp = new double[n];
        double[] fm = new double[n];
        double[][] jacobian = new double[n][n];
        for (int j = 0; j < n; j++) {
            // central difference; the model is linear between limits, so the step only has to beat round-off
            double eps = 1e-6 * Math.max(1.0, Math.abs(x0[j]));
            double[] xp = x0.clone();
            double[] xm = x0.clone();
            xp[j] += eps;
            xm[j] -= eps;
            dynamics.derivatives(0, xp, fp);
            dynamics.derivatives(0, xm, fm);
            for (int i = 0; i < n; i++) {
                jacobian[i][j] = (fp[i] - fm[i]) / (2 * eps);
            }
        }
        return new EigenDecompositionNonSymmetric(MatrixUtils.createRealMatrix(jacobian));
    }

    private static double zeta(double realPerS, double imagRadPerS) {
        double norm = Math.hypot(realPerS, imagRadPerS);
        return norm == 0 ? 0 : -realPerS / norm;
    }

    private static List<String> participatingAreas(Grid grid, FieldVector<Complex> vector) {
        int areaCount = grid.areas().size();
        double largest = 0;
        for (int a = 0; a < areaCount; a++) {
            largest = Math.max(largest, vector.getEntry(a).norm());
        }
        List<Integer> taking = new ArrayList<>();
        for (int a = 0; a < areaCount; a++) {
            if (largest > 0 && vector.getEntry(a).norm() >= PARTICIPATION_SHARE * largest) {
                taking.add(a);
            }
        }
        taking.sort(Comparator.comparingDouble((Integer a) -> -vector.getEntry(a).norm()));
        return taking.stream().map(a -> grid.areas().get(a).id()).toList();
    }
}
