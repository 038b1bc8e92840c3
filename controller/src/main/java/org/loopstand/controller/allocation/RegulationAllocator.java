package org.loopstand.controller.allocation;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Shares an area regulation level across the eligible units by participation factors.
 *
 * <p>Eligible: in remote, online, telemetry good, and not flagged as not following. The share of
 * unit i is {@code level·pf_i/Σpf} over the units still free; a unit whose base point plus share
 * falls outside its regulating range is held at the limit and the rest is shared again among the
 * others (at most n rounds). Units whose pf is 0 (at a dispatch limit) share only if no unit has a
 * positive pf, then equally. Finally each move from the present setpoint is bounded by the unit's
 * ramp per cycle. In the assist band every eligible unit moves at its full ramp toward its limit in
 * the needed direction. Stateless.
 */
public final class RegulationAllocator {
    private final double cycleS;

    /** @param cycleS control cycle, s, &gt; 0 */
    public RegulationAllocator(double cycleS) {
        if (!(cycleS > 0)) {
            throw new IllegalArgumentException("cycleS must be > 0, was " + cycleS);
        }
        this.cycleS = cycleS;
    }

    /**
     * @return the units eligible for regulation, and the excluded ones with their reasons added to
     *         {@code excludedOut}
     */
    public static List<UnitState> eligible(List<UnitState> units, Set<String> notFollowing, List<String> excludedOut) {
        List<UnitState> out = new ArrayList<>();
        for (UnitState u : units) {
            String why = !u.online() ? "offline" : !u.inRemote() ? "notInRemote" : !u.telemetryGood() ? "telemetryBad"
                    : notFollowing.contains(u.unitId()) ? "notFollowing" : null;
            if (why == null) {
                out.add(u);
            } else {
                excludedOut.add(u.unitId() + ":" + why);
            }
        }
        return out;
    }

    /** @return [low, high] regulation level the units can reach relative to their base points, MW */
    public static double[] reachableRangeMw(List<UnitState> eligible, Map<String, Double> basePointsMw) {
        double low = 0;
        double high = 0;
        for (UnitState u : eligible) {
            double base = base(basePointsMw, u);
            low += Math.min(0, u.regulatingMinMw() - base);
            high += Math.max(0, u.regulatingMaxMw() - base);
        }
        return new double[] {low, high};
    }

    /**
     * Regulating band.
     *
     * @param levelMw        area regulation level above the base points, MW
     * @param eligible       eligible units (see {@link #eligible})
     * @param basePointsMw   base point per unit, MW (missing = present setpoint)
     * @param pf             participation factor per unit (missing = 0)
     * @param excluded       excluded units' reasons, copied into the result
     */
    public Allocation allocate(double levelMw, List<UnitState> eligible, Map<String, Double> basePointsMw,
                               Map<String, Double> pf, List<String> excluded) {
        Map<String, Double> share = new HashMap<>();
        Map<String, Boolean> atRange = new HashMap<>();
        List<UnitState> free = new ArrayList<>(eligible);
        double remaining = levelMw;
        for (int round = 0; round <= eligible.size() && !free.isEmpty(); round++) {
            double sumPf = 0;
            for (UnitState u : free) {
                sumPf += Math.max(0, pf.getOrDefault(u.unitId(), 0.0));
            }
            List<UnitState> clamped = new ArrayList<>();
            for (UnitState u : free) {
                double w = sumPf > 0 ? Math.max(0, pf.getOrDefault(u.unitId(), 0.0)) / sumPf : 1.0 / free.size();
                double base = base(basePointsMw, u);
                double s = remaining * w;
                double lim = clampToRange(base + s, u) - base;
                share.put(u.unitId(), s);
                if (lim != s) {
                    share.put(u.unitId(), lim);
                    clamped.add(u);
                }
            }
            if (clamped.isEmpty()) {
                remaining = 0;
                break;
            }
            for (UnitState u : clamped) {
                remaining -= share.get(u.unitId());
                atRange.put(u.unitId(), true);
                free.remove(u);
            }
            if (free.isEmpty()) {
                break;
            }
        }
        double unallocated = free.isEmpty() ? remaining : 0;
        List<UnitAllocation> out = new ArrayList<>();
        for (UnitState u : eligible) {
            double base = base(basePointsMw, u);
            double s = share.getOrDefault(u.unitId(), 0.0);
            out.add(rampLimited(u, base, s, base + s, atRange.getOrDefault(u.unitId(), false)));
        }
        double[] range = reachableRangeMw(eligible, basePointsMw);
        return new Allocation(out, unallocated, range[0], range[1], excluded);
    }

    /**
     * Assist band: every eligible unit moves at full ramp in {@code direction} (+1 raise, −1 lower),
     * bounded by its regulating range.
     */
    public Allocation assist(int direction, List<UnitState> eligible, Map<String, Double> basePointsMw,
                             List<String> excluded) {
        if (direction != 1 && direction != -1) {
            throw new IllegalArgumentException("direction must be +1 or -1, was " + direction);
        }
        List<UnitAllocation> out = new ArrayList<>();
        for (UnitState u : eligible) {
            double base = base(basePointsMw, u);
            double wanted = direction > 0 ? u.regulatingMaxMw() : u.regulatingMinMw();
            out.add(rampLimited(u, base, wanted - base, wanted, true));
        }
        double[] range = reachableRangeMw(eligible, basePointsMw);
        return new Allocation(out, 0, range[0], range[1], excluded);
    }

    private UnitAllocation rampLimited(UnitState u, double base, double share, double wantedMw, boolean atRange) {
        double step = u.rampPerCycleMw(cycleS);
        double delta = wantedMw - u.setpointMw();
        LimitedBy by = atRange ? LimitedBy.REGULATING_RANGE : LimitedBy.NONE;
        if (Math.abs(delta) > step) {
            delta = Math.copySign(step, delta);
            by = LimitedBy.RAMP;
        }
        return new UnitAllocation(u.unitId(), base, share, u.setpointMw() + delta, delta, by);
    }

    private static double clampToRange(double mw, UnitState u) {
        return Math.max(u.regulatingMinMw(), Math.min(u.regulatingMaxMw(), mw));
    }

    private static double base(Map<String, Double> basePointsMw, UnitState u) {
        Double b = basePointsMw.get(u.unitId());
        return b != null ? b : u.setpointMw();
    }
}
