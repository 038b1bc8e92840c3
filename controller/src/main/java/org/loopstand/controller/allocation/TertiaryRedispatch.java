package org.loopstand.controller.allocation;

import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.loopstand.controller.dispatch.DispatchResult;
import org.loopstand.controller.dispatch.EconomicDispatch;
import org.loopstand.controller.dispatch.ParticipationFactors;
import org.loopstand.controller.dispatch.QuadraticCostUnit;

/**
 * Periodic re-dispatch of base points. Every {@code periodMs} the economic dispatch is solved for
 * the generation the units are asked for now (Σ base + regulation level), and the base points then
 * walk toward the new dispatch at {@code rampShare} of each unit's ramp per cycle. The caller moves
 * the regulation level down by the same total ({@code AreaRegulator.onBasePointsMoved}) so the
 * regulation the units carry falls back toward 0 and their regulating range is restored.
 * Not thread-safe.
 */
public final class TertiaryRedispatch {
    private final long periodMs;
    private final double rampShare;
    private final List<QuadraticCostUnit> costs;
    private long lastRunMs = Long.MIN_VALUE;
    private Map<String, Double> targetsMw = Map.of();
    private ParticipationFactors factors;

    /**
     * @param periodMs  time between re-dispatches, ms, &gt; 0 (e.g. 300000 for 5 min)
     * @param rampShare share of a unit's ramp used to move its base point, (0, 1]
     * @param costs     cost curves of the units of the area (limits = the units' regulating range)
     */
    public TertiaryRedispatch(long periodMs, double rampShare, List<QuadraticCostUnit> costs) {
        if (periodMs <= 0) {
            throw new IllegalArgumentException("periodMs must be > 0, was " + periodMs);
        }
        if (!(rampShare > 0 && rampShare <= 1)) {
            throw new IllegalArgumentException("rampShare must be in (0, 1], was " + rampShare);
        }
        if (costs == null || costs.isEmpty()) {
            throw new IllegalArgumentException("re-dispatch needs the cost curves of at least one unit");
        }
        this.periodMs = periodMs;
        this.rampShare = rampShare;
        this.costs = List.copyOf(costs);
        this.factors = ParticipationFactors.of(this.costs, java.util.Set.of());
    }

    public boolean due(long nowMs) {
        return lastRunMs == Long.MIN_VALUE || nowMs - lastRunMs >= periodMs;
    }

    /**
     * Solve the dispatch for {@code demandMw} and take its outputs as the new base point targets.
     * Participation factors are refreshed from it.
     *
     * @throws org.loopstand.controller.dispatch.InfeasibleDispatchException when the demand is
     *         outside the units' limits (targets stay as they were)
     */
    public DispatchResult redispatch(long nowMs, double demandMw) {
        lastRunMs = nowMs;
        DispatchResult r = EconomicDispatch.solve(costs, demandMw);
        targetsMw = new HashMap<>(r.outputMw());
        factors = ParticipationFactors.of(costs, r);
        return r;
    }

    /**
     * Solve the dispatch over the {@code eligible} units that have a cost curve, for the generation
     * they are asked for now (Σ of their setpoints), each within both its cost curve's limits and
     * its live regulating limits. Units out of the allocation take no part: their minimum would
     * otherwise make a feasible demand look infeasible and their share would be given to nobody.
     *
     * @return the dispatch (its demand is the eligible units' Σ setpoint), or null when no eligible
     *         unit has a cost curve (nothing to dispatch; targets stay as they were)
     * @throws org.loopstand.controller.dispatch.InfeasibleDispatchException when the demand is
     *         outside the eligible units' limits (targets stay as they were)
     */
    public DispatchResult redispatch(long nowMs, List<UnitState> eligible) {
        Map<String, QuadraticCostUnit> byId = new HashMap<>();
        costs.forEach(c -> byId.put(c.unitId(), c));
        List<QuadraticCostUnit> live = new java.util.ArrayList<>();
        double demandMw = 0;
        for (UnitState u : eligible) {
            QuadraticCostUnit c = byId.get(u.unitId());
            if (c == null) {
                continue;
            }
            double min = Math.max(c.minMw(), u.regulatingMinMw());
            double max = Math.min(c.maxMw(), u.regulatingMaxMw());
            if (min > max) {
                continue;
            }
            live.add(new QuadraticCostUnit(c.unitId(), c.aDollarPerH(), c.bDollarPerMwh(), c.cDollarPerMw2h(), min, max));
            demandMw += u.setpointMw();
        }
        lastRunMs = nowMs;
        if (live.isEmpty()) {
            return null;
        }
        DispatchResult r = EconomicDispatch.solve(live, demandMw);
        targetsMw = new HashMap<>(r.outputMw());
        factors = ParticipationFactors.of(live, r);
        return r;
    }

    /**
     * Move each base point toward its target by at most {@code rampShare·ramp·cycleS/60}.
     *
     * @return the new base points (units without a target keep theirs)
     */
    public Map<String, Double> stepBasePoints(Map<String, Double> basePointsMw, List<UnitState> units, double cycleS) {
        Map<String, Double> out = new LinkedHashMap<>(basePointsMw);
        for (UnitState u : units) {
            Double target = targetsMw.get(u.unitId());
            Double base = basePointsMw.get(u.unitId());
            if (target == null || base == null) {
                continue;
            }
            double step = rampShare * u.rampPerCycleMw(cycleS);
            double d = target - base;
            out.put(u.unitId(), base + Math.max(-step, Math.min(step, d)));
        }
        return out;
    }

    /** @return participation factors from the latest dispatch (initially over all units) */
    public ParticipationFactors participationFactors() {
        return factors;
    }

    public Map<String, Double> targetsMw() {
        return Map.copyOf(targetsMw);
    }

    public long periodMs() {
        return periodMs;
    }
}
