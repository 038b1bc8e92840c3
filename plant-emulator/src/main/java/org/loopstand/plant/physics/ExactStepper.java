package org.loopstand.plant.physics;

import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * One fixed step of the grid with each unit's linear block integrated exactly ({@link UnitBlocks}) and the network
 * (area frequencies, tie flows, loads) solved with it ({@link AreaEquations}: each area's Δf is a quintic over the step,
 * matched at both ends in value, slope and curvature). Given that polynomial, unit states, their power, its integral and
 * its rate at the end are exact, so the step is closed by three linear equations per area. For a linear system the
 * method is the (3,3) Padé approximant of the exponential: sixth order in the step and A-stable, so unlike RK4 it has
 * no stability limit from the units' own time constants (the step rule asks only the swing limit of it).
 *
 * <p>This class is the units' half. Nonlinear parts are decided at step boundaries, as RK4 clamps its valves after
 * each step: dead band (a unit whose area's Δf is inside its band gets no frequency input for the step, otherwise
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
    private final AreaEquations net;
    private final double h;
    private final double invH;
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
    /** the command's derivatives at the step's start for {@link ValveRatePath}, index k = k-th (1..5) */
    private final double[] commandTerms = new double[T];
    /** regime·2 + active at the last step, to see when the gains must be summed again */
    private final int[] regimeKey;
    private boolean regimesChanged = true;
    private final double[] work = new double[3];
    /**
     * A group is a block (free or held) in an area with at least one unit of that block: each unit's group in either
     * regime, and each group's block and area. Sites of many equal units have few groups; a site of all different
     * units has two per unit.
     */
    private final int[] freeGroup;
    private final int[] heldGroup;
    private final BlockPropagator[] groupBlock;
    private final int[] groupArea;
    /** per group: Σ_j Γ_ij·c_j, the block's response to the area's Δf polynomial this step, and the step it is for */
    private final double[] response;
    private final long[] responseStep;
    private long stepIndex;
    /**
     * per group, summed over its units at the step's start: state (3), constant command, held rate, command. The
     * blocks are linear, so the areas' known parts are computed once per group, not per unit.
     */
    private final double[] groupSums;
    private static final int SUMS = 6;
    /** the groups with a unit in them this step, so a site of all-different units touches only those */
    private final int[] touched;
    private int touchedCount;
    private final boolean[] isTouched;

    ExactStepper(GridDynamics dynamics, double stepS) {
        d = dynamics;
        h = stepS;
        invH = 1.0 / stepS;
        blocks = new UnitBlocks(d, stepS);
        net = new AreaEquations(d, stepS);
        int u = d.unitCount;
        tripDecay = new double[u];
        tripIntegralS = new double[u];
        servoDecay = new double[u];
        for (int i = 0; i < u; i++) {
            double tau = 1.0 / d.invTripS[i];
            tripDecay[i] = Math.exp(-h / tau);
            tripIntegralS[i] = tau * -Math.expm1(-h / tau);
            servoDecay[i] = Math.exp(-h * d.invGovernorS[i]);
        }
        regime = new int[u];
        active = new boolean[u];
        commandConstMw = new double[u];
        freeStartRateMwPerS = new double[u];
        regimeKey = new int[u];
        Arrays.fill(regimeKey, -1);
        freeGroup = new int[u];
        heldGroup = new int[u];
        Map<List<Object>, Integer> groups = new LinkedHashMap<>();
        for (int i = 0; i < u; i++) {
            Integer area = d.unitArea[i];
            freeGroup[i] = groups.computeIfAbsent(List.of(blocks.free[i], area), k -> groups.size());
            heldGroup[i] = groups.computeIfAbsent(List.of(blocks.held[i], area), k -> groups.size());
        }
        groupBlock = new BlockPropagator[groups.size()];
        groupArea = new int[groups.size()];
        groups.forEach((key, g) -> {
            groupBlock[g] = (BlockPropagator) key.get(0);
            groupArea[g] = (Integer) key.get(1);
        });
        response = new double[groups.size() * 3];
        responseStep = new long[groups.size()];
        Arrays.fill(responseStep, -1);
        groupSums = new double[groups.size() * SUMS];
        touched = new int[groups.size()];
        isTouched = new boolean[groups.size()];
    }

    /** Advances {@code x} from {@code timeS} by one step (load noise already set for the step). */
    void step(double timeS, double[] x) {
        net.begin(timeS, x);
        for (int u = 0; u < d.unitCount; u++) {
            if (d.online[u]) {
                chooseRegime(u, x);
            } else {
                regime[u] = OFF;
                regimeKey[u] = 2 * OFF;
            }
        }
        addGroups();
        if (regimesChanged) {
            sumGains();
            net.gainsChanged();
            regimesChanged = false;
        }
        net.finishStart(x);
        net.solve(x);
        stepIndex++;
        for (int u = 0; u < d.unitCount; u++) {
            advanceUnit(u, x);
        }
    }

    private void chooseRegime(int u, double[] x) {
        int b = d.unitOffset + GridDynamics.SLOTS_PER_UNIT * u;
        int a = d.unitArea[u];
        if (d.tripped[u]) {
            regime[u] = OFF;
            if (regimeKey[u] != 2 * OFF) {
                regimeKey[u] = 2 * OFF;
                regimesChanged = true;
            }
            double pm = d.mechanicalPowerMw(u, x);
            net.slope0[a] += pm;
            net.knownIntegral[a] += pm * tripIntegralS[u];
            net.knownEnd[a] += pm * tripDecay[u];
            net.knownSlopeEnd[a] -= pm * tripDecay[u] * d.invTripS[u];
            net.curve0[a] -= pm * d.invTripS[u];
            return;
        }
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
        freeStartRateMwPerS[u] = free;
        BlockPropagator p;
        if (rate != free) {
            regime[u] = HELD;
            p = blocks.held[u];
        } else {
            regime[u] = FREE;
            p = blocks.free[u];
        }
        int group = regime[u] == HELD ? heldGroup[u] : freeGroup[u];
        if (!isTouched[group]) {
            isTouched[group] = true;
            touched[touchedCount++] = group;
        }
        int g = group * SUMS;
        groupSums[g] += x[b];
        groupSums[g + 1] += x[b + 1];
        groupSums[g + 2] += x[b + 2];
        groupSums[g + 3] += commandConstMw[u];
        groupSums[g + 4] += regime[u] == HELD ? rate : 0.0;
        groupSums[g + 5] += command;
        int key = regime[u] * 2 + (active[u] ? 1 : 0);
        if (key != regimeKey[u]) {
            regimeKey[u] = key;
            regimesChanged = true;
        }
    }

    /** Each group's power, and its energy, power and power's rate at the end from all but Δf, into its area's sums. */
    private void addGroups() {
        for (int i = 0; i < touchedCount; i++) {
            int group = touched[i];
            isTouched[group] = false;
            BlockPropagator p = groupBlock[group];
            int a = groupArea[group];
            int g = group * SUMS;
            double v = groupSums[g];
            double s1 = groupSums[g + 1];
            double s2 = groupSums[g + 2];
            double constant = groupSums[g + 3];
            double rate = groupSums[g + 4];
            net.slope0[a] += p.out[0] * v + p.out[1] * s1 + p.out[2] * s2;
            net.knownIntegral[a] += p.outIntegral[0] * v + p.outIntegral[1] * s1 + p.outIntegral[2] * s2
                    + p.outIntegralInput[0] * constant;
            net.knownEnd[a] += p.outEnd[0] * v + p.outEnd[1] * s1 + p.outEnd[2] * s2 + p.outEndInput[0] * constant;
            net.knownSlopeEnd[a] += p.outSlopeEnd[0] * v + p.outSlopeEnd[1] * s1 + p.outSlopeEnd[2] * s2
                    + p.outSlopeEndInput[0] * constant;
            net.curve0[a] += p.outSlope[0] * v + p.outSlope[1] * s1 + p.outSlope[2] * s2
                    + p.outSlopeInput[0] * groupSums[g + 5];
            if (p.inputs > 1) {
                net.knownIntegral[a] += p.outIntegralInput[T] * rate;
                net.knownEnd[a] += p.outEndInput[T] * rate;
                net.knownSlopeEnd[a] += p.outSlopeEndInput[T] * rate;
                net.curve0[a] += p.outSlopeInput[1] * rate;
            }
            Arrays.fill(groupSums, g, g + SUMS, 0.0);
        }
        touchedCount = 0;
    }

    /** The units' frequency gains per area and polynomial term; they change only when a unit changes regime. */
    private void sumGains() {
        Arrays.fill(net.gainIntegral, 0);
        Arrays.fill(net.gainEnd, 0);
        Arrays.fill(net.gainSlopeEnd, 0);
        for (int u = 0; u < d.unitCount; u++) {
            if (regime[u] == OFF || !active[u]) {
                continue;
            }
            BlockPropagator p = regime[u] == HELD ? blocks.held[u] : blocks.free[u];
            int a = d.unitArea[u] * T;
            double k = d.gainMwPerHz[u];
            for (int j = 0; j < T; j++) {
                net.gainIntegral[a + j] -= k * p.outIntegralInput[j];
                net.gainEnd[a + j] -= k * p.outEndInput[j];
                net.gainSlopeEnd[a + j] -= k * p.outSlopeEndInput[j];
            }
        }
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
        propagate(blocks.free[u], freeGroup[u], u, x, b, 0.0);
        boolean free = work[0] >= lo && work[0] <= hi && !(v0 >= d.maxMw[u] && w0 > 0) && !(v0 <= d.minMw[u] && w0 < 0);
        boolean compensated = d.kind[u] == GridDynamics.HYDRO && d.param2[u] > 0;
        boolean rateLimited = raise != Double.POSITIVE_INFINITY || lower != Double.POSITIVE_INFINITY;
        if (free && rateLimited && (compensated || !withinByArea(u, w0, raise, lower))) {
            setValvePath(u, x, b);
            free = valvePath.staysWithin(raise, lower);
        }
        if (!free) {
            setValvePath(u, x, b);
            double limitedEnd = Math.max(lo, Math.min(hi, v0 + valvePath.clampedMoveMw(raise, lower)));
            propagate(blocks.held[u], heldGroup[u], u, x, b, (limitedEnd - v0) / h);
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
        return Math.max(w0, -k * net.slopeMin[a]) <= raise && Math.min(w0, -k * net.slopeMax[a]) >= -lower;
    }

    /** The free valve rate's path over the step; the target's rate is −K·Δf'(s) for the step's quintic Δf. */
    private void setValvePath(int u, double[] x, int b) {
        int a = d.unitArea[u] * T;
        double k = active[u] ? d.gainMwPerHz[u] : 0.0;
        for (int j = 1; j < T; j++) {
            commandTerms[j] = -k * net.coef[a + j];
        }
        boolean compensated = d.kind[u] == GridDynamics.HYDRO && d.param2[u] > 0;
        valvePath.set(d.invGovernorS[u], h, servoDecay[u], freeStartRateMwPerS[u], commandTerms,
                compensated ? commandConstMw[u] - k * net.coef[a] - x[b + 2] : 0.0,
                compensated ? d.param2[u] : 0.0, compensated ? d.param3[u] : 1.0);
    }

    /** Writes the block's end state into {@code work}; {@code rateMwPerS} is used by the held block only. */
    private void propagate(BlockPropagator p, int at, int u, double[] x, int b, double rateMwPerS) {
        double k = active[u] ? d.gainMwPerHz[u] : 0.0;
        int cols = p.inputs * T;
        if (k != 0 && responseStep[at] != stepIndex) {
            int a = d.unitArea[u] * T;
            for (int i = 0; i < 3; i++) {
                double sum = 0;
                for (int j = 0; j < T; j++) {
                    sum += p.gamma[i * cols + j] * net.coef[a + j];
                }
                response[3 * at + i] = sum;
            }
            responseStep[at] = stepIndex;
        }
        for (int i = 0; i < 3; i++) {
            int r = i * 3;
            int g = i * cols;
            double next = p.phi[r] * x[b] + p.phi[r + 1] * x[b + 1] + p.phi[r + 2] * x[b + 2]
                    + p.gamma[g] * commandConstMw[u];
            if (k != 0) {
                next -= k * response[3 * at + i];
            }
            if (p.inputs > 1) {
                next += p.gamma[g + T] * rateMwPerS;
            }
            work[i] = next;
        }
    }
}
