package org.loopstand.plant.physics;

import java.util.Arrays;

/**
 * The network half of {@link ExactStepper}'s step: areas' frequencies, tie flows and loads. Over the step each area's
 * Δf is the quintic Hermite polynomial through its value, slope and curvature at both ends, written
 * {@code Σ_j c_j·s^j/j!} (j = 0..5). The start's three come from the state (the power balance and its rate); the end's
 * three are the unknowns. With Δf a known polynomial the units' power (its integral, end value and end rate, from the
 * units' exact blocks), the tie flows and the loads are known, so three linear equations per area close the step: the
 * energy balance over the step, the power balance at its end and that balance's rate at its end (a 3·areas square
 * system, factored again only when the units' gains or the loads' frequency sensitivity change). For a linear system
 * this is the (3,3) Padé approximant of the exponential: sixth order and A-stable.
 *
 * <p>Per step: {@link #begin}, the units add their parts ({@code slope0}, {@code curve0}, {@code known*}, and
 * {@code gain*} after {@link #gainsChanged}), {@link #finishStart}, {@link #solve}; then {@link #coef} holds each
 * area's polynomial.
 */
final class AreaEquations {
    static final int T = BlockPropagator.TERMS;
    /** c_j of the step's polynomial per [f0, f0', f0'', f1, f1', f1''] (quintic Hermite in the basis s^j/j!) */
    private final double[][] hermite = new double[T][6];
    private final GridDynamics d;
    private final double h;
    private final int areas;
    /** h^{j+1}/(j+1)!: integral of s^j/j! over the step */
    final double[] int1 = new double[T];
    /** h^{j+2}/(j+2)!: double integral of s^j/j! over the step */
    private final double[] int2 = new double[T];
    /** per area: power at the start (MW), then Δf' (Hz/s) after {@link #finishStart} */
    final double[] slope0;
    /** per area: the power's rate at the start (MW/s), then Δf'' (Hz/s²) after {@link #finishStart} */
    final double[] curve0;
    /** per area: the units' energy over the step, power and its rate at the end, from all but the Δf input */
    final double[] knownIntegral;
    final double[] knownEnd;
    final double[] knownSlopeEnd;
    /** per area and term: the same from the Δf input's term c_j (the units' frequency gains) */
    final double[] gainIntegral;
    final double[] gainEnd;
    final double[] gainSlopeEnd;
    private boolean gainsChanged = true;
    private final double[] loadIntegral;
    private final double[] loadEnd;
    private final double[] loadSlope;
    /** per area: Σ load·k/f0 at the start, mid-step, end (MW/Hz), and its rate (MW/Hz/s) */
    private final double[] sensitivity0;
    private final double[] sensitivity;
    private final double[] lastSensitivity;
    /** the polynomial's coefficients per area and term: the known part, then (after solve) all of it */
    private final double[] knownCoef;
    final double[] coef;
    /** per area: bounds of Δf'(s) over the step, Hz/s (they bound every uncompensated unit's target rate) */
    final double[] slopeMin;
    final double[] slopeMax;
    private final double[][] matrix;
    private final double[] rhs;
    private final double[] scratch;
    private int[] pivot;
    private boolean buildMatrix;

    AreaEquations(GridDynamics dynamics, double stepS) {
        d = dynamics;
        h = stepS;
        areas = d.areaCount;
        double fact = 1;
        for (int j = 0; j < T; j++) {
            fact *= j + 1;
            int1[j] = Math.pow(h, j + 1) / fact;
            int2[j] = Math.pow(h, j + 2) / (fact * (j + 2));
        }
        for (int j = 0; j < 3; j++) {
            hermite[j][j] = 1;
        }
        double h2 = h * h;
        double h3 = h2 * h;
        double h4 = h3 * h;
        double h5 = h4 * h;
        hermite[3] = new double[] {-60 / h3, -36 / h2, -9 / h, 60 / h3, -24 / h2, 3 / h};
        hermite[4] = new double[] {360 / h4, 192 / h3, 36 / h2, -360 / h4, 168 / h3, -24 / h2};
        hermite[5] = new double[] {-720 / h5, -360 / h4, -60 / h3, 720 / h5, -360 / h4, 60 / h3};
        slope0 = new double[areas];
        curve0 = new double[areas];
        knownIntegral = new double[areas];
        knownEnd = new double[areas];
        knownSlopeEnd = new double[areas];
        gainIntegral = new double[areas * T];
        gainEnd = new double[areas * T];
        gainSlopeEnd = new double[areas * T];
        loadIntegral = new double[areas];
        loadEnd = new double[areas];
        loadSlope = new double[areas];
        sensitivity0 = new double[areas];
        sensitivity = new double[3 * areas];
        lastSensitivity = new double[3 * areas];
        knownCoef = new double[areas * T];
        coef = new double[areas * T];
        slopeMin = new double[areas];
        slopeMax = new double[areas];
        matrix = new double[3 * areas][3 * areas];
        rhs = new double[3 * areas];
        scratch = new double[3 * areas];
    }

    /** The units' gains were summed again: the matrix must be built and factored again. */
    void gainsChanged() {
        gainsChanged = true;
    }

    /** Starts a step: clears the units' sums and puts in the loads (noise already set for the step). */
    void begin(double timeS, double[] x) {
        Arrays.fill(knownIntegral, 0);
        Arrays.fill(knownEnd, 0);
        Arrays.fill(knownSlopeEnd, 0);
        Arrays.fill(curve0, 0);
        Arrays.fill(loadIntegral, 0);
        Arrays.fill(loadEnd, 0);
        Arrays.fill(loadSlope, 0);
        Arrays.fill(sensitivity0, 0);
        Arrays.fill(sensitivity, 0);
        double hour0 = d.startHourOfDay + timeS / 3600.0;
        double hourMid = d.startHourOfDay + (timeS + 0.5 * h) / 3600.0;
        double hourEnd = d.startHourOfDay + (timeS + h) / 3600.0;
        for (int a = 0; a < areas; a++) {
            slope0[a] = -d.dampingMwPerHz[a] * x[a] - d.schedule.offsetMw(a, timeS);
        }
        for (int l = 0; l < d.loadArea.length; l++) {
            int a = d.loadArea[l];
            double start = d.loadMw(l, hour0, 0.0);
            double mid = d.loadMw(l, hourMid, 0.0);
            double end = d.loadMw(l, hourEnd, 0.0);
            double perHz = d.loadSensitivity[l] / d.nominalHz[a];
            loadIntegral[a] += mid * h;
            loadEnd[a] += end;
            // the daily shape is linear within the hour and the noise is held: the rate over the step is the secant
            loadSlope[a] += (end - start) / h;
            sensitivity0[a] += start * perHz;
            sensitivity[a] += mid * perHz;
            sensitivity[areas + a] += end * perHz;
            sensitivity[2 * areas + a] += (end - start) / h * perHz;
            slope0[a] -= start * (1.0 + perHz * x[a]);
        }
        for (int a = 0; a < areas; a++) {
            double s0 = d.schedule.offsetMw(a, timeS);
            double sMid = d.schedule.offsetMw(a, timeS + 0.5 * h);
            double s1 = d.schedule.offsetMw(a, timeS + h);
            // Simpson's rule: exact for the schedule's steps and ramps inside the step
            loadIntegral[a] += h / 6 * (s0 + 4 * sMid + s1);
            loadEnd[a] += s1;
            loadSlope[a] += (s1 - s0) / h;
        }
    }

    /** After the units added their power and its rate: the start's Δf' and Δf'' of every area. */
    void finishStart(double[] x) {
        for (int t = 0; t < d.tieCount; t++) {
            double flow = d.tieScheduledMw[t] + x[areas + t];
            double flowRate = d.tieTwoPiT[t] * (x[d.tieFrom[t]] - x[d.tieTo[t]]);
            slope0[d.tieFrom[t]] -= flow;
            slope0[d.tieTo[t]] += flow;
            curve0[d.tieFrom[t]] -= flowRate;
            curve0[d.tieTo[t]] += flowRate;
        }
        for (int a = 0; a < areas; a++) {
            double m = d.inertiaMwSPerHz[a];
            slope0[a] /= m;
            curve0[a] = (curve0[a] - (d.dampingMwPerHz[a] + sensitivity0[a]) * slope0[a] - loadSlope[a]
                    - sensitivity[2 * areas + a] * x[a]) / m;
        }
    }

    /** Solves for the step's end: sets {@link #coef}, advances the tie flows and writes the areas' Δf into x. */
    void solve(double[] x) {
        for (int a = 0; a < areas; a++) {
            int o = a * T;
            double f0 = x[a];
            double s0 = slope0[a];
            double a0 = curve0[a];
            for (int j = 0; j < T; j++) {
                knownCoef[o + j] = hermite[j][0] * f0 + hermite[j][1] * s0 + hermite[j][2] * a0;
            }
        }
        buildMatrix = gainsChanged || !Arrays.equals(sensitivity, lastSensitivity);
        if (buildMatrix) {
            for (double[] row : matrix) {
                Arrays.fill(row, 0);
            }
            System.arraycopy(sensitivity, 0, lastSensitivity, 0, sensitivity.length);
        }
        buildEquations(x);
        if (buildMatrix) {
            pivot = LinearSolve.factor(matrix);
            gainsChanged = false;
        }
        LinearSolve.solve(matrix, pivot, rhs, scratch);
        for (int a = 0; a < areas; a++) {
            int o = a * T;
            for (int j = 0; j < T; j++) {
                coef[o + j] = knownCoef[o + j] + hermite[j][3] * rhs[a] + hermite[j][4] * rhs[areas + a]
                        + hermite[j][5] * rhs[2 * areas + a];
            }
            slopeMin[a] = ValveRatePath.polynomialExtreme(coef, o + 1, o + T, h, -1);
            slopeMax[a] = ValveRatePath.polynomialExtreme(coef, o + 1, o + T, h, 1);
        }
        for (int t = 0; t < d.tieCount; t++) {
            int from = d.tieFrom[t] * T;
            int to = d.tieTo[t] * T;
            double sum = 0;
            for (int j = 0; j < T; j++) {
                sum += (coef[from + j] - coef[to + j]) * int1[j];
            }
            x[areas + t] += d.tieTwoPiT[t] * sum;
        }
        for (int a = 0; a < areas; a++) {
            x[a] = rhs[a];
        }
    }

    /**
     * Unknowns: f1 of every area, then f1', then f1''. Row a: energy balance over the step,
     * M(f1 − f0) = ∫(Pm − load − D·Δf − export) ds; row areas + a: power balance at the end,
     * M·f1' = Pm(h) − load(h) − D·f1 − export(h); row 2·areas + a: its rate at the end,
     * M·f1'' = Pm'(h) − load'(h) − D·f1' − export'(h).
     */
    private void buildEquations(double[] x) {
        for (int a = 0; a < areas; a++) {
            double m = d.inertiaMwSPerHz[a];
            double damp = d.dampingMwPerHz[a];
            int e = a;
            int p = areas + a;
            int r = 2 * areas + a;
            rhs[e] = m * x[a] + knownIntegral[a] - loadIntegral[a];
            rhs[p] = knownEnd[a] - loadEnd[a];
            rhs[r] = knownSlopeEnd[a] - loadSlope[a];
            if (buildMatrix) {
                matrix[e][a] += m;
                matrix[p][areas + a] += m;
                matrix[p][a] += damp + sensitivity[areas + a];
                matrix[r][2 * areas + a] += m;
                matrix[r][areas + a] += damp + sensitivity[areas + a];
                matrix[r][a] += sensitivity[2 * areas + a];
            }
            addTerms(e, a, gainIntegral, a * T, -1);
            addTerms(e, a, int1, 0, damp + sensitivity[a]);
            addTerms(p, a, gainEnd, a * T, -1);
            addTerms(r, a, gainSlopeEnd, a * T, -1);
        }
        for (int t = 0; t < d.tieCount; t++) {
            int from = d.tieFrom[t];
            int to = d.tieTo[t];
            double flow = d.tieScheduledMw[t] + x[areas + t];
            double k = d.tieTwoPiT[t];
            rhs[from] -= flow * h;
            rhs[to] += flow * h;
            rhs[areas + from] -= flow;
            rhs[areas + to] += flow;
            addTerms(from, from, int2, 0, k);
            addTerms(from, to, int2, 0, -k);
            addTerms(to, to, int2, 0, k);
            addTerms(to, from, int2, 0, -k);
            addTerms(areas + from, from, int1, 0, k);
            addTerms(areas + from, to, int1, 0, -k);
            addTerms(areas + to, to, int1, 0, k);
            addTerms(areas + to, from, int1, 0, -k);
            if (buildMatrix) {
                // export'(h) = 2πT·(f1_from − f1_to)
                int rf = 2 * areas + from;
                int rt = 2 * areas + to;
                matrix[rf][from] += k;
                matrix[rf][to] -= k;
                matrix[rt][to] += k;
                matrix[rt][from] -= k;
            }
        }
    }

    /** Adds Σ_j scale·weights[offset + j]·c_j(area) to the left of equation {@code row}. */
    private void addTerms(int row, int area, double[] weights, int offset, double scale) {
        int o = area * T;
        double known = 0;
        for (int j = 0; j < T; j++) {
            known += weights[offset + j] * knownCoef[o + j];
        }
        rhs[row] -= scale * known;
        if (buildMatrix) {
            double[] line = matrix[row];
            for (int j = 0; j < T; j++) {
                double w = scale * weights[offset + j];
                line[area] += w * hermite[j][3];
                line[areas + area] += w * hermite[j][4];
                line[2 * areas + area] += w * hermite[j][5];
            }
        }
    }
}
