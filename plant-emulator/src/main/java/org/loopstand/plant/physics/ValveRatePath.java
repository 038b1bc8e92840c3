package org.loopstand.plant.physics;

/**
 * The free valve rate over one step, {@code w(s)} for 0 ≤ s ≤ h, MW/s. The servo {@code dv/dt = g·(target − v)} makes
 * the rate a lag of the target's rate, {@code dw/ds = g·(q − w)}; with {@code q(s) = q0 + q1·s + q2·s²/2} (a cubic
 * command) the solution is {@code w(s) = P(s) + c·e^{−g·s}}, P the quadratic {@code q − q'/g + q''/g²} and
 * {@code c = w(0) − P(0)}. {@link ExactStepper} keeps a unit's free step only if this rate stays inside the rate
 * limits for the whole step: the steam stages lag the valve, so they then cannot move faster than the unit's rate
 * either. One instance is reused for every unit and step (no allocation per step).
 */
final class ValveRatePath {
    /** at most 2 extremes inside the step (dw/ds has at most 2 roots: its own slope is monotone) plus both ends */
    private final double[] knots = new double[4];
    private int knotCount;
    private boolean knotsFound;
    private boolean solved;
    private double g;
    private double h;
    private double decayH;
    private double p0;
    private double p1;
    private double p2;
    private double c;
    private double q0;
    private double q1;
    private double q2;
    private double startRate;
    private double endRate;

    /**
     * @param gPerS        1 / governor time constant, 1/s (> 0)
     * @param stepS        step h, s
     * @param decayH       e^{−g·h}
     * @param rateMwPerS   free rate at the step's start, MW/s
     * @param command1     the command's first three derivatives at the start, MW/s, MW/s², MW/s³
     * @param lagGapMw     a hydro compensator's command − s2 at the start, MW (0 without one)
     * @param lagPerS      its 1/time constant p2, 1/s (0 without one)
     * @param commandShare the command's share p3 of the target, the rest being s2 (1 without a compensator). With a
     *                     compensator the target's rate {@code p3·command' + (1 − p3)·p2·(command − s2)} enters by its
     *                     second-order Taylor expansion over the step (exact otherwise; the lag is seconds long)
     */
    void set(double gPerS, double stepS, double decayH, double rateMwPerS, double command1, double command2,
             double command3, double lagGapMw, double lagPerS, double commandShare) {
        g = gPerS;
        h = stepS;
        this.decayH = decayH;
        double gap1 = command1 - lagPerS * lagGapMw;
        double gap2 = command2 - lagPerS * gap1;
        double lagShare = (1 - commandShare) * lagPerS;
        q0 = commandShare * command1 + lagShare * lagGapMw;
        q1 = commandShare * command2 + lagShare * gap1;
        q2 = commandShare * command3 + lagShare * gap2;
        startRate = rateMwPerS;
        solved = false;
        knotsFound = false;
    }

    /** The closed form, needed only when the cheap bound does not settle the step. */
    private void solve() {
        if (solved) {
            return;
        }
        solved = true;
        double lagS = 1.0 / g;
        p2 = q2;
        p1 = q1 - q2 * lagS;
        p0 = q0 - (q1 - q2 * lagS) * lagS;
        c = startRate - p0;
        endRate = p0 + h * (p1 + 0.5 * p2 * h) + c * decayH;
    }

    /** True when the free rate stays inside [−lowerMwPerS, raiseMwPerS] for the whole step. */
    boolean staysWithin(double raiseMwPerS, double lowerMwPerS) {
        if (startRate > raiseMwPerS || startRate < -lowerMwPerS) {
            return false;
        }
        // a lag never leaves the range of its start value and its input: settles most steps without the closed form
        if (quadraticExtreme(q0, q1, q2, h, 1) <= raiseMwPerS && quadraticExtreme(q0, q1, q2, h, -1) >= -lowerMwPerS) {
            return true;
        }
        solve();
        if (endRate > raiseMwPerS || endRate < -lowerMwPerS) {
            return false;
        }
        // both ends are inside: an inside extreme passes them by at most h²/8·max|w''| (w'' is monotone)
        double bulge = h * h / 8 * Math.max(Math.abs(p2 + g * g * c), Math.abs(p2 + g * g * c * decayH));
        if (Math.max(startRate, endRate) + bulge <= raiseMwPerS && Math.min(startRate, endRate) - bulge >= -lowerMwPerS) {
            return true;
        }
        findKnots();
        for (int i = 1; i + 1 < knotCount; i++) {
            double w = rate(knots[i]);
            if (w > raiseMwPerS || w < -lowerMwPerS) {
                return false;
            }
        }
        return true;
    }

    /** The valve's movement over the step with the free rate clamped to [−lowerMwPerS, raiseMwPerS], MW. */
    double clampedMoveMw(double raiseMwPerS, double lowerMwPerS) {
        solve();
        double bulge = h * h / 8 * Math.max(Math.abs(p2 + g * g * c), Math.abs(p2 + g * g * c * decayH));
        if (Math.min(startRate, endRate) - bulge >= raiseMwPerS) {
            return raiseMwPerS * h;
        }
        if (Math.max(startRate, endRate) + bulge <= -lowerMwPerS) {
            return -lowerMwPerS * h;
        }
        findKnots();
        double move = 0;
        for (int i = 0; i + 1 < knotCount; i++) {
            // w is monotone between knots: it crosses each limit at most once there
            double a = knots[i];
            double b = knots[i + 1];
            double x1 = crossing(a, b, raiseMwPerS);
            double x2 = crossing(a, b, -lowerMwPerS);
            double first = Math.min(x1, x2);
            double second = Math.max(x1, x2);
            move += clampedIntegral(a, first, raiseMwPerS, lowerMwPerS)
                    + clampedIntegral(first, second, raiseMwPerS, lowerMwPerS)
                    + clampedIntegral(second, b, raiseMwPerS, lowerMwPerS);
        }
        return move;
    }

    private double clampedIntegral(double a, double b, double raiseMwPerS, double lowerMwPerS) {
        if (b <= a) {
            return 0;
        }
        double mid = rate(0.5 * (a + b));
        if (mid >= raiseMwPerS) {
            return raiseMwPerS * (b - a);
        }
        if (mid <= -lowerMwPerS) {
            return -lowerMwPerS * (b - a);
        }
        return p0 * (b - a) + p1 * (b * b - a * a) / 2 + p2 * (b * b * b - a * a * a) / 6
                + c * Math.exp(-g * a) * -Math.expm1(-g * (b - a)) / g;
    }

    /** Where w crosses {@code level} inside [a, b] (w monotone there), else a. */
    private double crossing(double a, double b, double level) {
        double fa = rate(a) - level;
        double fb = rate(b) - level;
        if (fa == 0 || fa * fb >= 0) {
            return a;
        }
        return bisect(a, b, fa, true, level);
    }

    /** The step's ends and the rate's extremes inside it (roots of w'), in order. */
    private void findKnots() {
        if (knotsFound) {
            return;
        }
        knotsFound = true;
        knotCount = 0;
        knots[knotCount++] = 0;
        // w'' = p2 + g²·c·e^{−g·s} is monotone, so w' is monotone on either side of w'''s root
        double split = h;
        double ratio = -p2 / (g * g * c);
        if (c != 0 && ratio > 0) {
            double s = -Math.log(ratio) / g;
            if (s > 0 && s < h) {
                split = s;
            }
        }
        addSlopeRoot(0, split);
        if (split < h) {
            addSlopeRoot(split, h);
        }
        knots[knotCount++] = h;
    }

    private void addSlopeRoot(double a, double b) {
        double fa = slope(a);
        double fb = slope(b);
        if (fa != 0 && fa * fb < 0) {
            knots[knotCount++] = bisect(a, b, fa, false, 0);
        }
    }

    /** Bisection to round-off (rare: only near a limit); {@code ofRate} picks w − level, else w'. */
    private double bisect(double a, double b, double fa, boolean ofRate, double level) {
        double lo = a;
        double hi = b;
        double flo = fa;
        for (int i = 0; i < 100 && hi - lo > 1e-15 * h; i++) {
            double mid = 0.5 * (lo + hi);
            double f = ofRate ? rate(mid) - level : slope(mid);
            if (f == 0) {
                return mid;
            }
            if ((f > 0) == (flo > 0)) {
                lo = mid;
                flo = f;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }

    /** The greatest (sign 1) or least (sign −1) of {@code c0 + c1·s + c2·s²/2} over 0 ≤ s ≤ h. */
    static double quadraticExtreme(double c0, double c1, double c2, double h, int sign) {
        double best = sign * Math.max(sign * c0, sign * (c0 + h * (c1 + 0.5 * c2 * h)));
        double vertexS = c2 == 0 ? -1 : -c1 / c2;
        if (vertexS > 0 && vertexS < h) {
            best = sign * Math.max(sign * best, sign * (c0 + vertexS * (c1 + 0.5 * c2 * vertexS)));
        }
        return best;
    }

    double rate(double s) {
        solve();
        return p0 + s * (p1 + 0.5 * p2 * s) + c * Math.exp(-g * s);
    }

    private double slope(double s) {
        return p1 + p2 * s - g * c * Math.exp(-g * s);
    }
}
