package org.loopstand.plant.grid;

import java.util.List;
import java.util.Set;

import static org.loopstand.plant.grid.GridBuilder.nonNegative;
import static org.loopstand.plant.grid.GridBuilder.positive;

/**
 * A generating unit under construction (see {@link GeneratingUnit} for units and ranges). Defaults:
 * no dead band, output range 0..rating, no rate limit, starts at its minimum output, online, trip time
 * constant 0.5 s, regulating range = output range, ramp and pulse rate 10 % of rating per minute,
 * accepts setpoints, zero cost.
 */
public final class UnitSpec {
    final String id;
    private final String area;
    private Turbine turbine;
    private double ratingMw = Double.NaN;
    private double droopPct = Double.NaN;
    private double governorTimeConstantS = Double.NaN;
    private double deadBandHz;
    private Double minOutputMw;
    private Double maxOutputMw;
    private double raiseRateMwPerMin = Double.POSITIVE_INFINITY;
    private double lowerRateMwPerMin = Double.POSITIVE_INFINITY;
    private Double initialOutputMw;
    private boolean online = true;
    private double tripTimeConstantS = 0.5;
    private Double regulatingMinMw;
    private Double regulatingMaxMw;
    private Double rampMwPerMin;
    private Double pulseRateMwPerMin;
    private boolean acceptsSetpoints = true;
    private CostCurve cost = new CostCurve(0, 0, 0);

    UnitSpec(String id, String area) {
        this.id = id;
        this.area = area;
    }

    public UnitSpec nonReheat(double turbineTimeConstantS) { turbine = new Turbine.NonReheat(turbineTimeConstantS); return this; }
    public UnitSpec reheat(double steamChestTimeConstantS, double reheatTimeConstantS, double hpFraction) {
        turbine = new Turbine.Reheat(steamChestTimeConstantS, reheatTimeConstantS, hpFraction);
        return this;
    }
    /** Hydro; {@code transientDroopPct = NaN} means "same as the permanent droop" (no compensation). */
    public UnitSpec hydro(double waterStartingTimeS, double transientDroopPct, double resetTimeS) {
        turbine = new Turbine.Hydro(waterStartingTimeS, transientDroopPct, resetTimeS);
        return this;
    }
    public UnitSpec turbine(Turbine v) { turbine = v; return this; }
    public UnitSpec ratingMw(double v) { ratingMw = v; return this; }
    public UnitSpec droopPct(double v) { droopPct = v; return this; }
    public UnitSpec governorTimeConstantS(double v) { governorTimeConstantS = v; return this; }
    public UnitSpec deadBandHz(double v) { deadBandHz = v; return this; }
    public UnitSpec minOutputMw(double v) { minOutputMw = v; return this; }
    public UnitSpec maxOutputMw(double v) { maxOutputMw = v; return this; }
    public UnitSpec raiseRateMwPerMin(double v) { raiseRateMwPerMin = v; return this; }
    public UnitSpec lowerRateMwPerMin(double v) { lowerRateMwPerMin = v; return this; }
    public UnitSpec initialOutputMw(double v) { initialOutputMw = v; return this; }
    public UnitSpec online(boolean v) { online = v; return this; }
    public UnitSpec tripTimeConstantS(double v) { tripTimeConstantS = v; return this; }
    public UnitSpec regulatingMinMw(double v) { regulatingMinMw = v; return this; }
    public UnitSpec regulatingMaxMw(double v) { regulatingMaxMw = v; return this; }
    public UnitSpec rampMwPerMin(double v) { rampMwPerMin = v; return this; }
    public UnitSpec pulseRateMwPerMin(double v) { pulseRateMwPerMin = v; return this; }
    public UnitSpec acceptsSetpoints(boolean v) { acceptsSetpoints = v; return this; }
    public UnitSpec cost(double costA, double costB, double costC) { cost = new CostCurve(costA, costB, costC); return this; }

    private double min() { return minOutputMw != null ? minOutputMw : 0.0; }
    private double max() { return maxOutputMw != null ? maxOutputMw : ratingMw; }

    void check(List<GridProblem> p, Set<String> areas) {
        String s = "unit " + id;
        if (id == null || id.isBlank()) {
            p.add(new GridProblem("unit", "id", "must not be empty"));
        }
        if (!areas.contains(area)) {
            p.add(new GridProblem(s, "area", "unknown area '" + area + "' (known: " + areas + ")"));
        }
        positive(p, s, "ratingMw", ratingMw, "MW");
        positive(p, s, "droopPct", droopPct, "%");
        positive(p, s, "governorTimeConstantS", governorTimeConstantS, "s");
        nonNegative(p, s, "deadBandHz", deadBandHz, "Hz");
        nonNegative(p, s, "minOutputMw", min(), "MW");
        if (min() > max()) {
            p.add(new GridProblem(s, "minOutputMw", "is above maxOutputMw (" + min() + " > " + max() + " MW)"));
        }
        if (max() > ratingMw) {
            p.add(new GridProblem(s, "maxOutputMw", "is above the unit's rating (" + max() + " > " + ratingMw + " MW)"));
        }
        positive(p, s, "raiseRateMwPerMin", raiseRateMwPerMin, "MW/min");
        positive(p, s, "lowerRateMwPerMin", lowerRateMwPerMin, "MW/min");
        double init = initialOutputMw != null ? initialOutputMw : min();
        if (!(init >= min() && init <= max())) {
            p.add(new GridProblem(s, "initialOutputMw", "must lie in [" + min() + ", " + max() + "] MW, got " + init));
        }
        positive(p, s, "tripTimeConstantS", tripTimeConstantS, "s");
        double regMin = regulatingMinMw != null ? regulatingMinMw : min();
        double regMax = regulatingMaxMw != null ? regulatingMaxMw : max();
        if (regMin < min() || regMax > max() || regMin > regMax) {
            p.add(new GridProblem(s, "regulatingMinMw", "the regulating range [" + regMin + ", " + regMax
                    + "] MW must lie inside the output range [" + min() + ", " + max() + "] MW"));
        }
        if (rampMwPerMin != null) {
            positive(p, s, "rampMwPerMin", rampMwPerMin, "MW/min");
        }
        if (pulseRateMwPerMin != null) {
            positive(p, s, "pulseRateMwPerMin", pulseRateMwPerMin, "MW/min");
        }
        nonNegative(p, s, "costC", cost.costC(), "$/MW²h");
        checkTurbine(p, s);
    }

    private void checkTurbine(List<GridProblem> p, String s) {
        if (turbine == null) {
            p.add(new GridProblem(s, "turbine", "is missing (nonReheat, reheat or hydro)"));
        } else if (turbine instanceof Turbine.NonReheat t) {
            positive(p, s, "turbineTimeConstantS", t.turbineTimeConstantS(), "s");
        } else if (turbine instanceof Turbine.Reheat t) {
            positive(p, s, "steamChestTimeConstantS", t.steamChestTimeConstantS(), "s");
            positive(p, s, "reheatTimeConstantS", t.reheatTimeConstantS(), "s");
            if (!(t.hpFraction() > 0 && t.hpFraction() <= 1)) {
                p.add(new GridProblem(s, "hpFraction", "must lie in (0, 1], got " + t.hpFraction()));
            }
        } else if (turbine instanceof Turbine.Hydro t) {
            positive(p, s, "waterStartingTimeS", t.waterStartingTimeS(), "s");
            if (!Double.isNaN(t.transientDroopPct()) && !(t.transientDroopPct() >= droopPct)) {
                p.add(new GridProblem(s, "transientDroopPct", "must be at least droopPct (" + droopPct + " %), got " + t.transientDroopPct()));
            }
            nonNegative(p, s, "resetTimeS", t.resetTimeS(), "s");
        }
    }

    GeneratingUnit toUnit() {
        Turbine t = turbine;
        if (t instanceof Turbine.Hydro h && Double.isNaN(h.transientDroopPct())) {
            t = new Turbine.Hydro(h.waterStartingTimeS(), droopPct, h.resetTimeS());
        }
        double ramp = rampMwPerMin != null ? rampMwPerMin : 0.1 * ratingMw;
        return new GeneratingUnit(id, area, t, ratingMw, droopPct, governorTimeConstantS, deadBandHz, min(), max(),
                raiseRateMwPerMin, lowerRateMwPerMin, initialOutputMw != null ? initialOutputMw : min(), online,
                tripTimeConstantS, regulatingMinMw != null ? regulatingMinMw : min(),
                regulatingMaxMw != null ? regulatingMaxMw : max(), ramp,
                pulseRateMwPerMin != null ? pulseRateMwPerMin : ramp, acceptsSetpoints, cost);
    }
}
