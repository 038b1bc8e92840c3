package org.loopstand.plant.physics;

import java.util.Arrays;

/**
 * One fixed step of the grid with each unit's linear block integrated exactly ({@link UnitBlocks}) and the
 * network (area frequencies, tie flows) solved with it. Over the step each area's Δf is taken as the cubic
 * Hermite polynomial through its value and slope at both ends; the slope at the start comes from the power
 * balance, the end value and slope are the unknowns. Given that polynomial, unit states, their power and its
 * integral, tie flows and their integral are exact, so the area's energy balance over the step and its power
 * balance at the end give 2 linear equations per area, solved together (a 2·areas square system; its LU is
 * kept while the units' regimes stay the same). Like RK4 the method is of fourth order in the step; unlike RK4
 * it has no stability limit from the units' own time constants.
 *
 * <p>Nonlinear parts are decided at step boundaries, as RK4 clamps its valves after each step: dead band
 * (a unit whose area's Δf is inside its band gets no frequency input for the step, otherwise
 * {@code db(Δf) = Δf ∓ ε}), rate and position limits (the servo rate at the start sets whether the unit's power
 * enters the network equations as free or as moving at the limit; the end state is the free step only if the free
 * valve keeps its rate at every instant of the step ({@link ValveRatePath}) and its range, else the held step),
 * trips (every state decays on the trip time constant).
 */
final class ExactStepper {
    private static final int FREE = 0;
    private static final int HELD = 1;
    private static final int OFF = 2;
    private static final int T = BlockPropagator.TERMS;

    private final GridDynamics d;
    private final UnitBlocks blocks;
    private final double h;
    private final double invH;
    private final int areas;
    /** h^{j+1}/(j+1)!: integral of s^j/j! over the step */
    private final double[] int1 = new double[T];
    /** h^{j+2}/(j+2)!: double integral of s^j/j! over the step */
    private final double[] int2 = new double[T];
    /** Hermite coefficients of the unknown end value (β) and end slope (γ) in the s^j/j! basis */
    private final double[] beta;
    private final double[] gamma;
    private final double[] tripDecay;
    private final double[] tripIntegralS;
    private final int[] regime;
    private final boolean[] active;
    private final double[] commandConstMw;
    /** the servo's unlimited rate at the step's start, MW/s */
    private final double[] freeStartRateMwPerS;
    /** e^{−h/T_g}: the free valve rate's own decay over a step */
    private final double[] servoDecay;
    private final ValveRatePath valvePath = new ValveRatePath();
    /** regime·2 + active at the last step, to see when the gains must be summed again */
    private final int[] regimeKey;
    private boolean regimesChanged = true;
    private final double[] slope0;
    private final double[] knownIntegral;
    private final double[] knownEnd;
    private final double[] gainIntegral;
    private final double[] gainEnd;
    private final double[] loadIntegral;
    private final double[] loadEnd;
    private final double[] sensitivityMid;
    private final double[] sensitivityEnd;
    private final double[] coef;
    /** per area, the least and greatest Δf'(s) over the step, Hz/s: bounds every uncompensated unit's target rate */
    private final double[] slopeMin;
    private final double[] slopeMax;
    private final double[][] matrix;
    private final double[] rhs;
    private final LinearSolve solver = new LinearSolve();
    private final double[] work = new double[3];

    ExactStepper(GridDynamics dynamics, double stepS) {
        d = dynamics;
        h = stepS;
        invH = 1.0 / stepS;
        areas = d.areaCount;
        blocks = new UnitBlocks(d, stepS);
        double fact = 1;
        for (int j = 0; j < T; j++) {
            fact *= j + 1;
            int1[j] = Math.pow(h, j + 1) / fact;
            int2[j] = Math.pow(h, j + 2) / (fact * (j + 2));
        }
        beta = new double[] {0, 0, 6 / (h * h), -12 / (h * h * h)};
        gamma = new double[] {0, 0, -2 / h, 6 / (h * h)};
        int u = d.unitCount;
        tripDecay = new double[u];
        tripIntegralS = new double[u];
        for (int i = 0; i < u; i++) {
            double tau = 1.0 / d.invTripS[i];
            tripDecay[i] = Math.exp(-h / tau);
            tripIntegralS[i] = tau * -Math.expm1(-h / tau);
        }
        regime = new int[u];
        active = new boolean[u];
        commandConstMw = new double[u];
        freeStartRateMwPerS = new double[u];
        servoDecay = new double[u];
        for (int i = 0; i < u; i++) {
            servoDecay[i] = Math.exp(-h * d.invGovernorS[i]);
        }
        regimeKey = new int[u];
        Arrays.fill(regimeKey, -1);
        slope0 = new double[areas];
        knownIntegral = new double[areas];
        knownEnd = new double[areas];
        gainIntegral = new double[areas * T];
        gainEnd = new double[areas * T];
        loadIntegral = new double[areas];
        loadEnd = new double[areas];
        sensitivityMid = new double[areas];
        sensitivityEnd = new double[areas];
        coef = new double[areas * T];
        slopeMin = new double[areas];
        slopeMax = new double[areas];
        matrix = new double[2 * areas][2 * areas];
        rhs = new double[2 * areas];
    }

    /** Advances {@code x} from {@code timeS} by one step (load noise already set for the step). */
    void step(double timeS, double[] x) {
        Arrays.fill(knownIntegral, 0);
        Arrays.fill(knownEnd, 0);
        for (int a = 0; a < areas; a++) {
            slope0[a] = -d.dampingMwPerHz[a] * x[a] - d.schedule.offsetMw(a, timeS);
        }
        for (int u = 0; u < d.unitCount; u++) {
            if (d.online[u]) {
                slope0[d.unitArea[u]] += d.mechanicalPowerMw(u, x);
                chooseRegime(u, x);
            } else {
                regime[u] = OFF;
                regimeKey[u] = 2 * OFF;
            }
        }
        if (regimesChanged) {
            sumGains();
            regimesChanged = false;
        }
        loads(timeS, x);
        for (int t = 0; t < d.tieCount; t++) {
            double flow = d.tieScheduledMw[t] + x[areas + t];
            slope0[d.tieFrom[t]] -= flow;
            slope0[d.tieTo[t]] += flow;
        }
        for (int a = 0; a < areas; a++) {
            slope0[a] /= d.inertiaMwSPerHz[a];
        }
        buildEquations(timeS, x);
        solver.solve(matrix, rhs);
        for (int a = 0; a < areas; a++) {
            double f0 = x[a];
            double f1 = rhs[a];
            double s1 = rhs[areas + a];
            coef[a * T] = f0;
            coef[a * T + 1] = slope0[a];
            coef[a * T + 2] = (-6 * f0 - 4 * h * slope0[a]) / (h * h) + beta[2] * f1 + gamma[2] * s1;
            coef[a * T + 3] = (12 * f0 + 6 * h * slope0[a]) / (h * h * h) + beta[3] * f1 + gamma[3] * s1;
            slopeMin[a] = ValveRatePath.quadraticExtreme(slope0[a], coef[a * T + 2], coef[a * T + 3], h, -1);
            slopeMax[a] = ValveRatePath.quadraticExtreme(slope0[a], coef[a * T + 2], coef[a * T + 3], h, 1);
        }
        for (int t = 0; t < d.tieCount; t++) {
            x[areas + t] += d.tieTwoPiT[t] * differenceIntegral(t, int1);
        }
        for (int a = 0; a < areas; a++) {
            x[a] = rhs[a];
        }
        for (int u = 0; u < d.unitCount; u++) {
            advanceUnit(u, x);
        }
    }

    private void chooseRegime(int u, double[] x) {
        int b = d.unitOffset + GridDynamics.SLOTS_PER_UNIT * u;
        if (d.tripped[u]) {
            regime[u] = OFF;
            if (regimeKey[u] != 2 * OFF) {
                regimeKey[u] = 2 * OFF;
                regimesChanged = true;
            }
            double pm = d.mechanicalPowerMw(u, x);
            knownIntegral[d.unitArea[u]] += pm * tripIntegralS[u];
            knownEnd[d.unitArea[u]] += pm * tripDecay[u];
            return;
        }
        int a = d.unitArea[u];
        double f = x[a];
        double eps = d.deadBandHz[u];
        double k = d.gainMwPerHz[u];
        active[u] = eps == 0 || Math.abs(f) > eps;
        // command = constant − K·Δf(s) outside the band (db(Δf) = Δf ∓ ε), constant inside it
        commandConstMw[u] = d.loadReferenceMw[u] + (active[u] ? k * Math.copySign(eps, f) : 0.0);
        double command = commandConstMw[u] - (active[u] ? k * f : 0.0);
        double valve = x[b];
        double target = d.kind[u] == GridDynamics.HYDRO ? x[b + 2] + d.param3[u] * (command - x[b + 2]) : command;
        double free = (target - valve) * d.invGovernorS[u];
        double rate = Math.max(-d.lowerMwPerS[u], Math.min(d.raiseMwPerS[u], free));
        rate = Math.max((d.minMw[u] - valve) * invH, Math.min((d.maxMw[u] - valve) * invH, rate));
        if ((valve >= d.maxMw[u] && free > 0) || (valve <= d.minMw[u] && free < 0)) {
            rate = 0;
        }
        BlockPropagator p;
        double extraIntegral = 0;
        double extraEnd = 0;
        freeStartRateMwPerS[u] = free;
        if (rate != free) {
            regime[u] = HELD;
            p = blocks.held[u];
            extraIntegral = p.outIntegralInput[T] * rate;
            extraEnd = p.outEndInput[T] * rate;
        } else {
            regime[u] = FREE;
            p = blocks.free[u];
        }
        double v = x[b];
        double s1 = x[b + 1];
        double s2 = x[b + 2];
        knownIntegral[a] += p.outIntegral[0] * v + p.outIntegral[1] * s1 + p.outIntegral[2] * s2
                + p.outIntegralInput[0] * commandConstMw[u] + extraIntegral;
        knownEnd[a] += p.outEnd[0] * v + p.outEnd[1] * s1 + p.outEnd[2] * s2
                + p.outEndInput[0] * commandConstMw[u] + extraEnd;
        int key = regime[u] * 2 + (active[u] ? 1 : 0);
        if (key != regimeKey[u]) {
            regimeKey[u] = key;
            regimesChanged = true;
        }
    }

    /** The units' frequency gains per area and polynomial term; they change only when a unit changes regime. */
    private void sumGains() {
        Arrays.fill(gainIntegral, 0);
        Arrays.fill(gainEnd, 0);
        for (int u = 0; u < d.unitCount; u++) {
            if (regime[u] == OFF || !active[u]) {
                continue;
            }
            BlockPropagator p = regime[u] == HELD ? blocks.held[u] : blocks.free[u];
            int a = d.unitArea[u] * T;
            double k = d.gainMwPerHz[u];
            for (int j = 0; j < T; j++) {
                gainIntegral[a + j] -= k * p.outIntegralInput[j];
                gainEnd[a + j] -= k * p.outEndInput[j];
            }
        }
    }

    private void loads(double timeS, double[] x) {
        Arrays.fill(loadIntegral, 0);
        Arrays.fill(loadEnd, 0);
        Arrays.fill(sensitivityMid, 0);
        Arrays.fill(sensitivityEnd, 0);
        double hourMid = d.startHourOfDay + (timeS + 0.5 * h) / 3600.0;
        double hourEnd = d.startHourOfDay + (timeS + h) / 3600.0;
        for (int l = 0; l < d.loadArea.length; l++) {
            int a = d.loadArea[l];
            double mid = d.loadMw(l, hourMid, 0.0);
            double end = d.loadMw(l, hourEnd, 0.0);
            double perHz = d.loadSensitivity[l] / d.nominalHz[a];
            loadIntegral[a] += mid * h;
            loadEnd[a] += end;
            sensitivityMid[a] += mid * perHz;
            sensitivityEnd[a] += end * perHz;
            slope0[a] -= d.loadMw(l, d.startHourOfDay + timeS / 3600.0, x[a]);
        }
        for (int a = 0; a < areas; a++) {
            // Simpson's rule: exact for the schedule's steps and ramps inside the step
            loadIntegral[a] += h / 6 * (d.schedule.offsetMw(a, timeS) + 4 * d.schedule.offsetMw(a, timeS + 0.5 * h)
                    + d.schedule.offsetMw(a, timeS + h));
            loadEnd[a] += d.schedule.offsetMw(a, timeS + h);
        }
    }

    /**
     * Row a: energy balance over the step, M(f1 − f0) = ∫(Pm − load − D·Δf − export) ds; row areas + a: power balance at
     * the end, M·f1' = Pm(h) − load(h) − D·f1 − export(h). Unknowns: f1 of every area, then f1' of every area.
     */
    private void buildEquations(double timeS, double[] x) {
        for (double[] row : matrix) {
            Arrays.fill(row, 0);
        }
        Arrays.fill(rhs, 0);
        for (int a = 0; a < areas; a++) {
            double m = d.inertiaMwSPerHz[a];
            matrix[a][a] += m;
            rhs[a] += -m * x[a] - knownIntegral[a] + loadIntegral[a];
            matrix[areas + a][areas + a] += m;
            matrix[areas + a][a] += d.dampingMwPerHz[a] + sensitivityEnd[a];
            rhs[areas + a] += loadEnd[a] - knownEnd[a];
            double dampMid = d.dampingMwPerHz[a] + sensitivityMid[a];
            for (int j = 0; j < T; j++) {
                addCoefficient(a, a, j, -gainIntegral[a * T + j] + dampMid * int1[j], x);
                addCoefficient(areas + a, a, j, -gainEnd[a * T + j], x);
            }
        }
        for (int t = 0; t < d.tieCount; t++) {
            int from = d.tieFrom[t];
            int to = d.tieTo[t];
            double flow = d.tieScheduledMw[t] + x[areas + t];
            double k = d.tieTwoPiT[t];
            rhs[from] += flow * h;
            rhs[to] -= flow * h;
            rhs[areas + from] += flow;
            rhs[areas + to] -= flow;
            for (int j = 0; j < T; j++) {
                addCoefficient(from, from, j, k * int2[j], x);
                addCoefficient(from, to, j, -k * int2[j], x);
                addCoefficient(to, from, j, -k * int2[j], x);
                addCoefficient(to, to, j, k * int2[j], x);
                addCoefficient(areas + from, from, j, k * int1[j], x);
                addCoefficient(areas + from, to, j, -k * int1[j], x);
                addCoefficient(areas + to, from, j, -k * int1[j], x);
                addCoefficient(areas + to, to, j, k * int1[j], x);
            }
        }
        for (int i = 0; i < rhs.length; i++) {
            rhs[i] = -rhs[i];
        }
    }

    /** Adds {@code value}·c_j(area) to equation {@code row}, c_j being linear in the area's unknown end value and slope. */
    private void addCoefficient(int row, int area, int j, double value, double[] x) {
        double f0 = x[area];
        double s0 = slope0[area];
        double known = switch (j) {
            case 0 -> f0;
            case 1 -> s0;
            case 2 -> (-6 * f0 - 4 * h * s0) / (h * h);
            default -> (12 * f0 + 6 * h * s0) / (h * h * h);
        };
        rhs[row] += value * known;
        matrix[row][area] += value * beta[j];
        matrix[row][areas + area] += value * gamma[j];
    }

    private double differenceIntegral(int t, double[] weights) {
        int from = d.tieFrom[t] * T;
        int to = d.tieTo[t] * T;
        double sum = 0;
        for (int j = 0; j < T; j++) {
            sum += (coef[from + j] - coef[to + j]) * weights[j];
        }
        return sum;
    }

    private void advanceUnit(int u, double[] x) {
        int b = d.unitOffset + GridDynamics.SLOTS_PER_UNIT * u;
        if (!d.online[u]) {
            return;
        }
        if (d.tripped[u]) {
            x[b] *= tripDecay[u];
            x[b + 1] *= tripDecay[u];
            x[b + 2] *= tripDecay[u];
            return;
        }
        double v0 = x[b];
        double raise = d.raiseMwPerS[u];
        double lower = d.lowerMwPerS[u];
        double lo = Math.max(d.minMw[u], v0 - lower * h);
        double hi = Math.min(d.maxMw[u], v0 + raise * h);
        double w0 = freeStartRateMwPerS[u];
        // The regime chosen at the start set the unit's power in the network equations; the end state is the free
        // step only if the free valve keeps its rate at every instant of the step (then the stages, lags of the valve,
        // keep it too) and stays inside its range; else the valve moves at the constant rate that brings it where the
        // free rate, clamped to the limits, would have, and the stages follow that.
        propagate(blocks.free[u], u, x, b, 0.0);
        boolean free = work[0] >= lo && work[0] <= hi && !(v0 >= d.maxMw[u] && w0 > 0) && !(v0 <= d.minMw[u] && w0 < 0);
        boolean compensated = d.kind[u] == GridDynamics.HYDRO && d.param2[u] > 0;
        if (free && (compensated || !withinByArea(u, w0, raise, lower))) {
            setValvePath(u, x, b);
            free = valvePath.staysWithin(raise, lower);
        }
        if (!free) {
            setValvePath(u, x, b);
            double limitedEnd = Math.max(lo, Math.min(hi, v0 + valvePath.clampedMoveMw(raise, lower)));
            propagate(blocks.held[u], u, x, b, (limitedEnd - v0) / h);
            work[0] = limitedEnd;
        }
        x[b] = work[0];
        x[b + 1] = work[1];
        x[b + 2] = work[2];
    }

    /** Most steps: the free rate, a lag of −K·Δf', stays between its start and −K times the area's Δf' range. */
    private boolean withinByArea(int u, double w0, double raise, double lower) {
        int a = d.unitArea[u];
        double k = active[u] ? d.gainMwPerHz[u] : 0.0;
        return Math.max(w0, -k * slopeMin[a]) <= raise && Math.min(w0, -k * slopeMax[a]) >= -lower;
    }

    /** The free valve rate's path over the step; the target's rate is −K·Δf'(s) for the step's cubic Δf. */
    private void setValvePath(int u, double[] x, int b) {
        int a = d.unitArea[u] * T;
        double k = active[u] ? d.gainMwPerHz[u] : 0.0;
        boolean compensated = d.kind[u] == GridDynamics.HYDRO && d.param2[u] > 0;
        valvePath.set(d.invGovernorS[u], h, servoDecay[u], freeStartRateMwPerS[u], -k * coef[a + 1], -k * coef[a + 2],
                -k * coef[a + 3], compensated ? commandConstMw[u] - k * coef[a] - x[b + 2] : 0.0,
                compensated ? d.param2[u] : 0.0, compensated ? d.param3[u] : 1.0);
    }

    /** Writes the block's end state into {@code work}; {@code rateMwPerS} is used by the held block only. */
    private void propagate(BlockPropagator p, int u, double[] x, int b, double rateMwPerS) {
        int a = d.unitArea[u] * T;
        double k = active[u] ? d.gainMwPerHz[u] : 0.0;
        int cols = p.inputs * T;
        for (int i = 0; i < 3; i++) {
            int r = i * 3;
            int g = i * cols;
            double next = p.phi[r] * x[b] + p.phi[r + 1] * x[b + 1] + p.phi[r + 2] * x[b + 2]
                    + p.gamma[g] * commandConstMw[u];
            for (int j = 0; j < T; j++) {
                next -= p.gamma[g + j] * k * coef[a + j];
            }
            if (p.inputs > 1) {
                next += p.gamma[g + T] * rateMwPerS;
            }
            work[i] = next;
        }
    }
}
