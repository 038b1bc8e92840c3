package org.loopstand.controller.cycle;

import org.loopstand.controller.schedule.AreaSchedule;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.loopstand.controller.ace.AceCalculator;
import org.loopstand.controller.ace.AceInputs;
import org.loopstand.controller.ace.AceResult;
import org.loopstand.controller.allocation.Allocation;
import org.loopstand.controller.allocation.RegulationAllocator;
import org.loopstand.controller.allocation.TertiaryRedispatch;
import org.loopstand.controller.allocation.LimitedBy;
import org.loopstand.controller.allocation.UnitAllocation;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.dispatch.DispatchResult;
import org.loopstand.controller.dispatch.InfeasibleDispatchException;
import org.loopstand.controller.regulation.AceBand;
import org.loopstand.controller.regulation.AreaRegulator;
import org.loopstand.controller.regulation.RegulationResult;
import org.loopstand.controller.safety.UsableValue;

/**
 * The per-area state of the cycle: ACE calculator, regulator, base points and optional tertiary
 * re-dispatch. Used by {@link ControlCycle}; takes only {@link UsableValue}s, never raw values.
 */
final class AreaController {
    private final AreaSetup setup;
    private final AceCalculator ace;
    private final AreaRegulator regulator;
    private final RegulationAllocator allocator;
    private final TertiaryRedispatch redispatch;
    private final Map<String, Double> basePointsMw = new LinkedHashMap<>();
    private final Map<String, Double> staticFactors = new HashMap<>();
    private Set<String> lastEligible = Set.of();
    /** a command to one of the area's units did not land since the last cycle */
    private boolean moveNotExecuted;

    AreaController(AreaSetup setup) {
        this.setup = setup;
        this.ace = new AceCalculator(setup.ace());
        this.regulator = new AreaRegulator(setup.regulation());
        this.allocator = new RegulationAllocator(setup.regulation().cycleS());
        this.redispatch = setup.redispatchPeriodMs() > 0
                ? new TertiaryRedispatch(setup.redispatchPeriodMs(), setup.redispatchRampShare(), setup.costs()) : null;
        if (!setup.costs().isEmpty()) {
            staticFactors.putAll(org.loopstand.controller.dispatch.ParticipationFactors
                    .of(setup.costs(), Set.of()).factors());
        }
    }

    String areaId() {
        return setup.ace().areaId();
    }

    AceResult computeAce(UsableValue frequencyHz, List<UsableValue> tieFlowsMw, AreaSchedule schedule,
                         double timeErrorS, double inadvertentAccumMwh) {
        double ni = 0;
        for (UsableValue t : tieFlowsMw) {
            ni += t.value();
        }
        return ace.compute(new AceInputs(ni, schedule.netInterchangeScheduledMw(), frequencyHz.value(),
                schedule.frequencyScheduledHz(), timeErrorS, inadvertentAccumMwh));
    }

    /**
     * A command to a unit of this area was refused, failed or was never sent: the next cycle's
     * integration is withheld, so the integrator does not run on a move that did not happen (while
     * every command fails, it stays where it was instead of winding up).
     */
    void onMoveNotExecuted() {
        moveNotExecuted = true;
    }

    void suspend() {
        regulator.suspend();
    }

    /** Bumpless resume: the regulator starts from where the eligible units are now. */
    void resume(List<UnitState> eligible, double aceMw) {
        for (UnitState u : eligible) {
            basePointsMw.putIfAbsent(u.unitId(), u.setpointMw());
        }
        regulator.resume(currentLevelMw(eligible), aceMw);
        lastEligible = idsOf(eligible);
    }

    private static Set<String> idsOf(List<UnitState> units) {
        Set<String> ids = new java.util.TreeSet<>();
        units.forEach(u -> ids.add(u.unitId()));
        return ids;
    }

    /** One regulating cycle of this area. */
    AreaCycleResult regulate(AceResult aceResult, List<UnitState> eligible, List<String> excluded, long nowMs,
                             List<String> notes) {
        for (UnitState u : eligible) {
            basePointsMw.putIfAbsent(u.unitId(), u.setpointMw());
        }
        double baseMovedMw = redispatch != null ? tertiary(eligible, nowMs, notes) : 0;
        Set<String> ids = idsOf(eligible);
        if (ids.isEmpty()) {
            // the reason of each unit's absence goes with it: {unit}:{offline|notInRemote|telemetryBad|notFollowing}
            notes.add("noEligibleUnits:" + areaId() + (excluded.isEmpty() ? "" : ":" + String.join(",", excluded)));
            regulator.suspend();
            lastEligible = ids;
            return new AreaCycleResult(areaId(), aceResult, null, null);
        }
        if (!ids.equals(lastEligible)) {
            // a unit left or joined: start from where the eligible units are, so nobody is yanked
            regulator.resume(currentLevelMw(eligible), aceResult.aceMw());
        }
        lastEligible = ids;
        double[] range = RegulationAllocator.reachableRangeMw(eligible, basePointsMw);
        RegulationResult reg = regulator.step(aceResult.aceMw(), range[0], range[1]);
        if (moveNotExecuted) {
            regulator.withholdIntegration();
            moveNotExecuted = false;
        }
        Allocation alloc = null;
        // in the quiet band only base point moves go out (the regulation level is held)
        if (reg.band() == AceBand.REGULATING || (reg.band() == AceBand.QUIET && baseMovedMw > 0)) {
            alloc = allocator.allocate(reg.levelMw(), eligible, basePointsMw, factors(), excluded);
            holdIntegratorAtRampLimit(reg, alloc);
        } else if (reg.band() == AceBand.ASSIST) {
            int direction = reg.filteredAceMw() < 0 ? 1 : -1;
            alloc = allocator.assist(direction, eligible, basePointsMw, excluded);
            double level = 0;
            for (UnitAllocation a : alloc.units()) {
                level += a.targetMw() - a.basePointMw();
            }
            regulator.trackLevel(level, reg.filteredAceMw());
        }
        return new AreaCycleResult(areaId(), aceResult, reg, alloc);
    }

    /**
     * Anti-wind-up against the ramp (conditional integration): when units' moves in the direction
     * the PI pushes were cut by their ramp and the level runs ahead of what the allocation reached
     * by more than those units' ramp step of one cycle, this cycle's integration is taken back. The
     * integrator keeps everything it had accumulated before; it only stops growing while the units
     * truly cannot keep up. The one-step margin keeps integrating through a unit whose telemetry lags
     * one cycle behind our commands (it looks ramp-cut by the move it has not shown yet) and through
     * moves below the minimum pulse. Without the anti-wind-up a slow unit lets the integrator run far
     * ahead after a large disturbance and the area overshoots for minutes once the error changes sign
     * (seen on the demo site with a 14 MW/min steam unit). Tracking the reached level instead
     * (I = reached − kp·e) threw away the accumulated error and the P part every cycle a unit was
     * ramp-cut: the PI became proportional-only and ACE stayed at −15…−30 MW.
     */
    private void holdIntegratorAtRampLimit(RegulationResult reg, Allocation alloc) {
        double push = Math.signum(-reg.filteredAceMw());
        double rampStepMw = 0;
        double reachedMw = 0;
        for (UnitAllocation a : alloc.units()) {
            if (a.limitedBy() == LimitedBy.RAMP && a.deltaMw() * push > 0) {
                rampStepMw += Math.abs(a.deltaMw());
            }
            reachedMw += a.targetMw() - a.basePointMw();
        }
        if (rampStepMw > 0 && (reg.levelMw() - reachedMw) * push > rampStepMw) {
            regulator.withholdIntegration();
        }
    }

    /** @return Σ|base point move| this cycle, MW */
    private double tertiary(List<UnitState> eligible, long nowMs, List<String> notes) {
        if (redispatch.due(nowMs)) {
            try {
                DispatchResult d = redispatch.redispatch(nowMs, eligible);
                if (d != null) {
                    notes.add(String.format(java.util.Locale.ROOT, "redispatch:%s:lambda=%.4f:demandMw=%.1f:basePointsMw=%s",
                            areaId(), d.lambdaDollarPerMwh(), d.demandMw(), rounded(d.outputMw())));
                }
            } catch (InfeasibleDispatchException e) {
                notes.add(String.format(java.util.Locale.ROOT, "redispatchInfeasible:%s:demandMw=%.1f:rangeMw=%.1f..%.1f",
                        areaId(), e.demandMw(), e.minTotalMw(), e.maxTotalMw()));
            }
        }
        Map<String, Double> moved = redispatch.stepBasePoints(basePointsMw, eligible, setup.regulation().cycleS());
        double total = 0;
        double absTotal = 0;
        for (Map.Entry<String, Double> e : moved.entrySet()) {
            double d = e.getValue() - basePointsMw.get(e.getKey());
            total += d;
            absTotal += Math.abs(d);
        }
        basePointsMw.putAll(moved);
        if (total != 0) {
            regulator.onBasePointsMoved(total);
        }
        return absTotal;
    }

    private static Map<String, Double> rounded(Map<String, Double> mw) {
        Map<String, Double> out = new java.util.TreeMap<>();
        mw.forEach((k, v) -> out.put(k, Math.round(v * 10) / 10.0));
        return out;
    }

    private Map<String, Double> factors() {
        return redispatch != null ? redispatch.participationFactors().factors() : staticFactors;
    }

    double currentLevelMw(List<UnitState> eligible) {
        double level = 0;
        for (UnitState u : eligible) {
            level += u.setpointMw() - basePointsMw.getOrDefault(u.unitId(), u.setpointMw());
        }
        return level;
    }

    Map<String, Double> basePointsMw() {
        return Map.copyOf(basePointsMw);
    }

    void setBasePoint(String unitId, double mw) {
        basePointsMw.put(unitId, mw);
    }

    AreaRegulator regulator() {
        return regulator;
    }

    static List<UnitState> unitsOf(String areaId, List<UnitState> all) {
        List<UnitState> out = new ArrayList<>();
        for (UnitState u : all) {
            if (u.areaId().equals(areaId)) {
                out.add(u);
            }
        }
        return out;
    }
}
