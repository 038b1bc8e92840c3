package org.loopstand.plant.physics;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.LoadModel;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.grid.Turbine;

/**
 * The right-hand side of the grid's differential equations, in MW, Hz and seconds.
 *
 * <p>State layout: {@code [Δf of each area (Hz) | Δflow of each tie (MW) | 3 slots per unit]}; unit slots
 * are (valve, turbine, reheater) for steam, (gate, water column, governor compensation) for hydro.
 * Arrays instead of objects so a 1,000-unit site stays in cache.
 */
public final class GridDynamics {
    static final int NON_REHEAT = 0;
    static final int REHEAT = 1;
    static final int HYDRO = 2;
    static final int SLOTS_PER_UNIT = 3;

    final int areaCount;
    final int tieCount;
    final int unitCount;
    final int unitOffset;
    final double[] inertiaMwSPerHz;
    final double[] dampingMwPerHz;
    final double[] nominalHz;
    final int[] tieFrom;
    final int[] tieTo;
    final double[] tieTwoPiT;
    final double[] tieScheduledMw;
    final int[] unitArea;
    final int[] kind;
    final double[] gainMwPerHz;
    final double[] invGovernorS;
    final double[] deadBandHz;
    final double[] minMw;
    final double[] maxMw;
    final double[] raiseMwPerS;
    final double[] lowerMwPerS;
    final double[] param1;
    final double[] param2;
    final double[] param3;
    final double[] invTripS;
    final boolean[] online;
    final boolean[] tripped;
    final double[] loadReferenceMw;
    final int[] loadArea;
    final double[] loadBaseMw;
    final double[] loadSensitivity;
    final double[][] loadShape;
    final double[] loadNoiseMw;
    final LoadSchedule schedule;
    final double startHourOfDay;
    private final double[] balanceMw;

    GridDynamics(Grid grid, double startHourOfDay) {
        this.startHourOfDay = startHourOfDay;
        areaCount = grid.areas().size();
        tieCount = grid.ties().size();
        unitCount = grid.units().size();
        unitOffset = areaCount + tieCount;
        inertiaMwSPerHz = new double[areaCount];
        dampingMwPerHz = new double[areaCount];
        nominalHz = new double[areaCount];
        for (int a = 0; a < areaCount; a++) {
            Area area = grid.areas().get(a);
            inertiaMwSPerHz[a] = area.inertiaMwSPerHz();
            dampingMwPerHz[a] = area.dampingMwPerHz();
            nominalHz[a] = area.nominalFrequencyHz();
        }
        tieFrom = new int[tieCount];
        tieTo = new int[tieCount];
        tieTwoPiT = new double[tieCount];
        tieScheduledMw = new double[tieCount];
        for (int t = 0; t < tieCount; t++) {
            TieLine tie = grid.ties().get(t);
            tieFrom[t] = grid.areaIndex(tie.fromArea());
            tieTo[t] = grid.areaIndex(tie.toArea());
            tieTwoPiT[t] = 2.0 * Math.PI * tie.synchronizingMwPerRad();
            tieScheduledMw[t] = tie.scheduledFlowMw();
        }
        unitArea = new int[unitCount];
        kind = new int[unitCount];
        gainMwPerHz = new double[unitCount];
        invGovernorS = new double[unitCount];
        deadBandHz = new double[unitCount];
        minMw = new double[unitCount];
        maxMw = new double[unitCount];
        raiseMwPerS = new double[unitCount];
        lowerMwPerS = new double[unitCount];
        param1 = new double[unitCount];
        param2 = new double[unitCount];
        param3 = new double[unitCount];
        invTripS = new double[unitCount];
        online = new boolean[unitCount];
        tripped = new boolean[unitCount];
        loadReferenceMw = new double[unitCount];
        for (int u = 0; u < unitCount; u++) {
            GeneratingUnit unit = grid.units().get(u);
            unitArea[u] = grid.areaIndex(unit.area());
            gainMwPerHz[u] = unit.governorGainMwPerHz(nominalHz[unitArea[u]]);
            invGovernorS[u] = 1.0 / unit.governorTimeConstantS();
            deadBandHz[u] = unit.deadBandHz();
            minMw[u] = unit.minOutputMw();
            maxMw[u] = unit.maxOutputMw();
            raiseMwPerS[u] = unit.raiseRateMwPerMin() / 60.0;
            lowerMwPerS[u] = unit.lowerRateMwPerMin() / 60.0;
            invTripS[u] = 1.0 / unit.tripTimeConstantS();
            online[u] = unit.online();
            loadReferenceMw[u] = unit.online() ? unit.initialOutputMw() : 0.0;
            Turbine turbine = unit.turbine();
            if (turbine instanceof Turbine.NonReheat t) {
                kind[u] = NON_REHEAT;
                param1[u] = 1.0 / t.turbineTimeConstantS();
            } else if (turbine instanceof Turbine.Reheat t) {
                kind[u] = REHEAT;
                param1[u] = 1.0 / t.steamChestTimeConstantS();
                param2[u] = 1.0 / t.reheatTimeConstantS();
                param3[u] = t.hpFraction();
            } else if (turbine instanceof Turbine.Hydro t) {
                kind[u] = HYDRO;
                param1[u] = 2.0 / t.waterStartingTimeS();
                double lagS = t.transientDroopPct() / unit.droopPct() * t.resetTimeS();
                param2[u] = lagS > 0 ? 1.0 / lagS : 0.0;
                param3[u] = lagS > 0 ? t.resetTimeS() / lagS : 1.0;
            }
        }
        int loadCount = grid.loads().size();
        loadArea = new int[loadCount];
        loadBaseMw = new double[loadCount];
        loadSensitivity = new double[loadCount];
        loadShape = new double[loadCount][];
        loadNoiseMw = new double[loadCount];
        for (int l = 0; l < loadCount; l++) {
            LoadModel load = grid.loads().get(l);
            loadArea[l] = grid.areaIndex(load.area());
            loadBaseMw[l] = load.baseMw();
            loadSensitivity[l] = load.frequencySensitivityPctPerPct();
            loadShape[l] = load.dailyShapePu().stream().mapToDouble(Double::doubleValue).toArray();
        }
        schedule = new LoadSchedule(areaCount);
        balanceMw = new double[areaCount];
    }

    /** @return the length of the state vector */
    public int dimension() {
        return unitOffset + SLOTS_PER_UNIT * unitCount;
    }

    /** @return the steady operating point at t = 0: nominal frequency, scheduled flows, units at their reference */
    public double[] initialState() {
        double[] x = new double[dimension()];
        for (int u = 0; u < unitCount; u++) {
            int b = unitOffset + SLOTS_PER_UNIT * u;
            double p = loadReferenceMw[u];
            x[b] = p;
            x[b + 1] = p;
            x[b + 2] = p;
        }
        return x;
    }

    /** Fills {@code dxdt} with the time derivative of {@code x} at {@code timeS}. */
    public void derivatives(double timeS, double[] x, double[] dxdt) {
        double[] acc = balanceMw;
        double hourOfDay = startHourOfDay + timeS / 3600.0;
        for (int a = 0; a < areaCount; a++) {
            acc[a] = -dampingMwPerHz[a] * x[a] - schedule.offsetMw(a, timeS);
        }
        for (int l = 0; l < loadArea.length; l++) {
            int a = loadArea[l];
            acc[a] -= loadMw(l, hourOfDay, x[a]);
        }
        for (int t = 0; t < tieCount; t++) {
            int from = tieFrom[t];
            int to = tieTo[t];
            double flow = tieScheduledMw[t] + x[areaCount + t];
            acc[from] -= flow;
            acc[to] += flow;
            dxdt[areaCount + t] = tieTwoPiT[t] * (x[from] - x[to]);
        }
        for (int u = 0; u < unitCount; u++) {
            int b = unitOffset + SLOTS_PER_UNIT * u;
            if (!online[u]) {
                dxdt[b] = 0;
                dxdt[b + 1] = 0;
                dxdt[b + 2] = 0;
                continue;
            }
            acc[unitArea[u]] += unitDerivatives(u, b, x, dxdt);
        }
        for (int a = 0; a < areaCount; a++) {
            dxdt[a] = acc[a] / inertiaMwSPerHz[a];
        }
    }

    /** Writes the unit's three derivatives and returns its mechanical power, MW. */
    private double unitDerivatives(int u, int b, double[] x, double[] dxdt) {
        double valve = x[b];
        double s1 = x[b + 1];
        double s2 = x[b + 2];
        double pm;
        double target;
        double command = loadReferenceMw[u] - gainMwPerHz[u] * deadBand(x[unitArea[u]], deadBandHz[u]);
        switch (kind[u]) {
            case NON_REHEAT -> {
                pm = s1;
                dxdt[b + 1] = (valve - s1) * param1[u];
                dxdt[b + 2] = 0;
                target = command;
            }
            case REHEAT -> {
                pm = param3[u] * s1 + (1.0 - param3[u]) * s2;
                dxdt[b + 1] = (valve - s1) * param1[u];
                dxdt[b + 2] = (s1 - s2) * param2[u];
                target = command;
            }
            default -> {
                // water column (1 − sTw)/(1 + sTw/2) = 3/(1 + sTw/2) − 2
                pm = 3.0 * s1 - 2.0 * valve;
                dxdt[b + 1] = (valve - s1) * param1[u];
                if (param2[u] > 0) {
                    dxdt[b + 2] = (command - s2) * param2[u];
                    target = s2 + param3[u] * (command - s2);
                } else {
                    dxdt[b + 2] = 0;
                    target = command;
                }
            }
        }
        if (tripped[u]) {
            // Steam or water shut off: every stage decays on the trip time constant, no limits apply.
            dxdt[b] = -valve * invTripS[u];
            dxdt[b + 1] = -s1 * invTripS[u];
            dxdt[b + 2] = -s2 * invTripS[u];
            return pm;
        }
        // Limits act on the servo's own state (not on its input), so nothing winds up.
        double rate = (target - valve) * invGovernorS[u];
        if (rate > raiseMwPerS[u]) {
            rate = raiseMwPerS[u];
        } else if (rate < -lowerMwPerS[u]) {
            rate = -lowerMwPerS[u];
        }
        if ((valve >= maxMw[u] && rate > 0) || (valve <= minMw[u] && rate < 0)) {
            rate = 0;
        }
        dxdt[b] = rate;
        return pm;
    }

    /** Holds each valve inside its position limits after a step (the stages' derivatives were already limited). */
    void clampValves(double[] x) {
        for (int u = 0; u < unitCount; u++) {
            if (online[u] && !tripped[u]) {
                int b = unitOffset + SLOTS_PER_UNIT * u;
                x[b] = Math.max(minMw[u], Math.min(maxMw[u], x[b]));
            }
        }
    }

    double loadMw(int l, double hourOfDay, double deviationHz) {
        double base = loadBaseMw[l] * shapeFactor(loadShape[l], hourOfDay) + loadNoiseMw[l];
        return base * (1.0 + loadSensitivity[l] * deviationHz / nominalHz[loadArea[l]]);
    }

    double mechanicalPowerMw(int u, double[] x) {
        int b = unitOffset + SLOTS_PER_UNIT * u;
        return switch (kind[u]) {
            case NON_REHEAT -> x[b + 1];
            case REHEAT -> param3[u] * x[b + 1] + (1.0 - param3[u]) * x[b + 2];
            default -> 3.0 * x[b + 1] - 2.0 * x[b];
        };
    }

    static double deadBand(double deviationHz, double halfWidthHz) {
        if (deviationHz > halfWidthHz) {
            return deviationHz - halfWidthHz;
        }
        if (deviationHz < -halfWidthHz) {
            return deviationHz + halfWidthHz;
        }
        return 0.0;
    }

    static double shapeFactor(double[] shape, double hourOfDay) {
        if (shape.length == 0) {
            return 1.0;
        }
        double h = hourOfDay % 24.0;
        if (h < 0) {
            h += 24.0;
        }
        int i = (int) h;
        double frac = h - i;
        double a = shape[i % 24];
        return a + (shape[(i + 1) % 24] - a) * frac;
    }
}
