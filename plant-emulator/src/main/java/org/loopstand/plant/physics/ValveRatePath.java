package org.loopstand.plant.physics;

/**
 * The free valve rate over one step, {@code w(s)} for 0 ≤ s ≤ h, MW/s. The servo {@code dv/dt = g·(target − v)} makes
 * the rate a lag of the target's rate, {@code dw/ds = g·(q − w)}; with {@code q(s) = Σ_j q_j·s^j/j!} a quartic (the
 * rate of a quintic command) the solution is {@code w(s) = P(s) + c·e^{−g·s}}, P the quartic
 * {@code q − q'/g + q''/g² − q'''/g³ + q''''/g⁴} and {@code c = w(0) − P(0)}. {@link ExactStepper} keeps a unit's free
 * step only if this rate stays inside the rate limits for the whole step: the steam stages lag the valve, so they then
 * cannot move faster than the unit's rate either. One instance is reused for every unit and step (no allocation per
 * step).
 */
final class ValveRatePath {
    /** degree of the target rate's polynomial */
    private static final int DEGREE = 4;
    /**
     * w^(k) is monotone between the roots of w^(k+1), and w^(5) = (−g)^5·c·e^{−g·s} has none: so w'''' has at most 1
     * root, w''' 2, w'' 3, w' 4 inside the step; with both ends at most 6 knots
     */
    private final double[] knots = new double[DEGREE + 3];
    private final double[] scratch = new double[DEGREE + 3];
    private final double[] q = new double[DEGREE + 1];
    /** P in the basis s^j/j! */
    private final double[] p = new double[DEGREE + 1];
    /** (−g)^k·c, k = 0..DEGREE: the exponential part's factor in w^(k) */
    private final double[] expFactor = new double[DEGREE + 1];
    private int knotCount;
    private boolean knotsFound;
    private boolean solved;
    private double g;
    private double h;
    private double decayH;
    private double c;
    private double startRate;
    private double endRate;

    /**
     * @param gPerS        1 / governor time constant, 1/s (> 0)
     * @param stepS        step h, s
     * @param decayH       e^{−g·h}
     * @param rateMwPerS   free rate at the step's start, MW/s
     * @param command      the command's derivatives at the start: {@code command[k]} = k-th derivative, k = 1..5
     *                     (MW/s^k; index 0 is not read)
     * @param lagGapMw     a hydro compensator's command − s2 at the start, MW (0 without one)
     * @param lagPerS      its 1/time constant p2, 1/s (0 without one)
     * @param commandShare the command's share p3 of the target, the rest being s2 (1 without a compensator). With a
     *                     compensator the target's rate {@code p3·command' + (1 − p3)·p2·(command − s2)} enters by its
     *                     fourth-order Taylor expansion over the step (exact otherwise; the lag is seconds long)
     */
    void set(double gPerS, double stepS, double decayH, double rateMwPerS, double[] command, double lagGapMw,
             double lagPerS, double commandShare) {
        g = gPerS;
        h = stepS;
        this.decayH = decayH;
        double lagShare = (1 - commandShare) * lagPerS;
        double gap = lagGapMw;
        for (int k = 0; k <= DEGREE; k++) {
            // gap = command − s2 obeys gap' = command' − p2·gap
            q[k] = commandShare * command[k + 1] + lagShare * gap;
            gap = command[k + 1] - lagPerS * gap;
        }
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
        for (int j = 0; j <= DEGREE; j++) {
            double sum = 0;
            double factor = 1;
            for (int m = 0; j + m <= DEGREE; m++) {
                sum += factor * q[j + m];
                factor *= -lagS;
            }
            p[j] = sum;
        }
        c = startRate - p[0];
        double factor = c;
        for (int k = 0; k <= DEGREE; k++) {
            expFactor[k] = factor;
            factor *= -g;
        }
        endRate = polynomial(0, h) + c * decayH;
    }

    /** True when the free rate stays inside [−lowerMwPerS, raiseMwPerS] for the whole step. */
    boolean staysWithin(double raiseMwPerS, double lowerMwPerS) {
        if (startRate > raiseMwPerS || startRate < -lowerMwPerS) {
            return false;
        }
        // a lag never leaves the range of its start value and its input: settles most steps without the closed form
        double tail = Math.abs(q[3]) * h * h * h / 6 + Math.abs(q[4]) * h * h * h * h / 24;
        if (quadraticExtreme(q[0], q[1], q[2], h, 1) + tail <= raiseMwPerS
                && quadraticExtreme(q[0], q[1], q[2], h, -1) - tail >= -lowerMwPerS) {
            return true;
        }
        solve();
        if (endRate > raiseMwPerS || endRate < -lowerMwPerS) {
            return false;
        }
        // both ends are inside: an inside extreme passes them by at most h²/8·max|w''|
        double bulge = bulge();
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
        double bulge = bulge();
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

    /** An upper bound of h²/8·max|w''| over the step (w'' = P'' + g²·c·e^{−g·s}). */
    private double bulge() {
        double curve = Math.max(Math.abs(polynomialExtreme(p, 2, p.length, h, 1)),
                Math.abs(polynomialExtreme(p, 2, p.length, h, -1)));
        return h * h / 8 * (curve + g * g * Math.abs(c));
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
        double sum = 0;
        double powA = a;
        double powB = b;
        double fact = 1;
        for (int j = 0; j <= DEGREE; j++) {
            sum += p[j] * (powB - powA) / fact;
            powA *= a;
            powB *= b;
            fact *= j + 2;
        }
        return sum + c * Math.exp(-g * a) * -Math.expm1(-g * (b - a)) / g;
    }

    /** Where w crosses {@code level} inside [a, b] (w monotone there), else a. */
    private double crossing(double a, double b, double level) {
        double fa = rate(a) - level;
        double fb = rate(b) - level;
        if (fa == 0 || fa * fb >= 0) {
            return a;
        }
        return bisect(a, b, fa, 0, level);
    }

    /** The step's ends and the rate's extremes inside it (roots of w'), in order. */
    private void findKnots() {
        if (knotsFound) {
            return;
        }
        knotsFound = true;
        // from w'''' (monotone on the whole step) down to w': each one's roots split the next one's monotone pieces
        double[] pieces = scratch;
        int pieceCount = 2;
        pieces[0] = 0;
        pieces[1] = h;
        for (int k = DEGREE; k >= 1; k--) {
            double[] roots = pieces == scratch ? knots : scratch;
            int count = 0;
            roots[count++] = 0;
            for (int i = 0; i + 1 < pieceCount; i++) {
                double fa = derivative(k, pieces[i]);
                double fb = derivative(k, pieces[i + 1]);
                if (fa != 0 && fa * fb < 0) {
                    roots[count++] = bisect(pieces[i], pieces[i + 1], fa, k, 0);
                }
            }
            roots[count++] = h;
            pieces = roots;
            pieceCount = count;
        }
        if (pieces != knots) {
            System.arraycopy(pieces, 0, knots, 0, pieceCount);
        }
        knotCount = pieceCount;
    }

    /**
     * The root of w^(k) − level in [a, b], where it is monotone and changes sign, to round-off (rare: only near a
     * limit): regula falsi with the Illinois halving of a stale end's value, and every third try a bisection, so the
     * bracket at least halves every three tries (usually a handful of tries in all).
     */
    private double bisect(double a, double b, double fa, int k, double level) {
        double lo = a;
        double hi = b;
        double flo = fa;
        double fhi = derivative(k, b) - level;
        int side = 0;
        for (int i = 0; i < 200 && hi - lo > 1e-15 * h; i++) {
            double mid = i % 3 == 2 ? 0.5 * (lo + hi) : lo - flo * (hi - lo) / (fhi - flo);
            if (!(mid > lo && mid < hi)) {
                mid = 0.5 * (lo + hi);
            }
            double f = derivative(k, mid) - level;
            if (f == 0) {
                return mid;
            }
            if ((f > 0) == (flo > 0)) {
                lo = mid;
                flo = f;
                fhi = side == 1 ? 0.5 * fhi : fhi;
                side = 1;
            } else {
                hi = mid;
                fhi = f;
                flo = side == -1 ? 0.5 * flo : flo;
                side = -1;
            }
        }
        return 0.5 * (lo + hi);
    }

    /**
     * Bounds the greatest (sign 1) or least (sign −1) of {@code Σ_{from≤j<to} t_j·s^(j−from)/(j−from)!} over
     * 0 ≤ s ≤ h: exact for its quadratic part, the higher terms added by their largest size.
     */
    static double polynomialExtreme(double[] t, int from, int to, double h, int sign) {
        double tail = 0;
        double power = h * h * h / 6;
        for (int j = from + 3; j < to; j++) {
            tail += Math.abs(t[j]) * power;
            power *= h / (j - from + 1);
        }
        double c1 = from + 1 < to ? t[from + 1] : 0;
        double c2 = from + 2 < to ? t[from + 2] : 0;
        return quadraticExtreme(t[from], c1, c2, h, sign) + sign * tail;
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
        return derivative(0, s);
    }

    /** w^(k)(s) = P^(k)(s) + (−g)^k·c·e^{−g·s} */
    private double derivative(int k, double s) {
        return polynomial(k, s) + expFactor[k] * Math.exp(-g * s);
    }

    /** P^(k)(s) */
    private double polynomial(int k, double s) {
        double sum = 0;
        for (int j = DEGREE; j >= k; j--) {
            sum = sum * s / (j - k + 1) + p[j];
        }
        return sum;
    }
}
