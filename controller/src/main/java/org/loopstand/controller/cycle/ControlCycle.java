package org.loopstand.controller.cycle;

import org.loopstand.controller.intake.AreaCycleInputs;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.loopstand.controller.ace.AceResult;
import org.loopstand.controller.allocation.RegulationAllocator;
import org.loopstand.controller.allocation.UnitAllocation;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.following.FollowingCheck;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseOutcome;
import org.loopstand.controller.pulse.PulsePlanner;
import org.loopstand.controller.safety.InterlockState;
import org.loopstand.controller.safety.UsableValue;

/**
 * One deterministic control cycle: validated inputs in, ACE, regulation, allocation and planned
 * commands out. No clock, no bus, no threads: the caller passes the cycle time in
 * {@link CycleInputs#nowMs()}, so the same inputs always give the same outcome.
 *
 * <p>Order within a cycle: (1) interlock conditions: bus link, every area's frequency, every tie
 * flow and schedule must be usable (a held value is usable), then ACE within its sanity limit;
 * each is judged per area ({@link AreaInterlocks}: only the areas whose data are unusable are
 * suspended; a bad tie suspends both its ends; link down or a superseded epoch suspends all);
 * (2) unit-following checks; (3) a suspended area's regulator freezes and nothing is planned for
 * it; on the cycle an area resumes, its regulator tracks its units' present level;
 * (4) per regulating area: tertiary base point step, filter, band, PI, allocation, pulse/setpoint
 * planning. The outcome is regulating while any area regulates.
 * Values are taken only through {@link UsableValue#from}, so nothing is computed from a value
 * that failed validation. Not thread-safe: one cycle thread.
 */
public final class ControlCycle {
    private final ControlCycleSettings settings;
    private final Map<String, AreaController> areas = new LinkedHashMap<>();
    private final AreaInterlocks interlocks;
    private final FollowingStage following;
    private final PulsePlanner pulses;
    private final Map<String, LastCommand> lastCommands = new HashMap<>();
    /** commands that did not land since the last cycle, as notes {@code commandNotExecuted:{unit}:{reason}} */
    private final List<String> notExecuted = new ArrayList<>();
    /** set once a unit refused a command as from a superseded epoch; suspends for good */
    private String supersededEpochReason;
    private final Map<String, String> unitAreas = new HashMap<>();
    private long lastCycleMs;
    /** commands in a row that did not land, per unit (reset by an accepted one) */
    private final Map<String, Integer> failedInRow = new HashMap<>();
    /** exclusions decided between cycles, reported with the next cycle */
    private final List<FollowingDecision> pendingDecisions = new ArrayList<>();

    private record LastCommand(long endMs, double setpointMw) {
    }

    public ControlCycle(ControlCycleSettings settings) {
        this.settings = settings;
        for (AreaSetup a : settings.areas()) {
            areas.put(a.ace().areaId(), new AreaController(a));
        }
        this.interlocks = new AreaInterlocks(areas.keySet(), settings.interlock());
        this.following = new FollowingStage(settings);
        this.pulses = new PulsePlanner(settings.pulses());
    }

    public CycleOutcome step(CycleInputs in) {
        lastCycleMs = in.nowMs();
        List<String> notes = new ArrayList<>();
        notes.addAll(notExecuted);
        notExecuted.clear();
        AreaInterlocks.Conditions conditions = new AreaInterlocks.Conditions();
        if (!in.busLinkUp()) {
            conditions.global("busLinkDown");
        }
        if (supersededEpochReason != null) {
            conditions.global(supersededEpochReason);
        }
        Map<String, AceResult> aceByArea = new LinkedHashMap<>();
        Map<String, Double> freqDevByArea = new HashMap<>();
        Map<String, AreaCycleInputs> inputsByArea = new HashMap<>();
        for (AreaCycleInputs a : in.areas()) {
            if (!areas.containsKey(a.areaId())) {
                notes.add("unknownArea:" + a.areaId());
            } else {
                inputsByArea.put(a.areaId(), a);
            }
        }
        for (AreaController area : areas.values()) {
            AreaCycleInputs a = inputsByArea.get(area.areaId());
            if (a == null) {
                conditions.area(area.areaId(), "areaInputsMissing:" + area.areaId(), "");
                continue;
            }
            AceResult ace = AreaInputCheck.ace(area, a, conditions);
            UsableValue.from(a.frequencyHz()).ifPresent(f -> {
                if (a.schedule() != null) {
                    double df = f.value() - a.schedule().frequencyScheduledHz();
                    freqDevByArea.put(area.areaId(), df);
                    following.recordFrequency(area.areaId(), in.nowMs() - f.ageMs(), df);
                }
            });
            if (ace != null) {
                AreaInputCheck.sanity(area.areaId(), ace.aceMw(), settings.interlock().aceSanityLimitMw(), conditions);
                aceByArea.put(area.areaId(), ace);
            }
        }
        Map<String, AreaInterlockState> interlock = interlocks.evaluate(conditions, in.nowMs());
        boolean anyRegulating = interlock.values().stream().anyMatch(AreaInterlockState::mayCommand);
        InterlockState state = anyRegulating ? InterlockState.REGULATING : InterlockState.SUSPENDED;
        List<String> reasons = anyRegulating ? List.of() : conditions.allReasons(areas.keySet());

        List<UnitState> units = effectiveUnits(in.units());
        List<FollowingDecision> decisions = new ArrayList<>(pendingDecisions);
        pendingDecisions.clear();
        List<FollowingCheck> checks = following.check(units, freqDevByArea.keySet(), in.nowMs(), decisions);
        Set<String> flagged = following.flaggedUnits();

        List<AreaCycleResult> results = new ArrayList<>();
        List<PlannedCommand> commands = new ArrayList<>();
        Map<String, UnitState> byId = new HashMap<>();
        // grouped once: a scan of every unit per area was 50 × 10,000 comparisons per cycle
        Map<String, List<UnitState>> unitsByArea = new HashMap<>();
        for (UnitState u : units) {
            byId.put(u.unitId(), u);
            unitAreas.put(u.unitId(), u.areaId());
            unitsByArea.computeIfAbsent(u.areaId(), k -> new ArrayList<>()).add(u);
        }
        for (AreaController area : areas.values()) {
            AceResult ace = aceByArea.get(area.areaId());
            if (!interlock.get(area.areaId()).mayCommand()) {
                // suspended: the regulator is frozen (no integration), no command, no probe
                area.suspend();
                results.add(new AreaCycleResult(area.areaId(), ace, null, null));
                continue;
            }
            List<String> excluded = new ArrayList<>();
            List<UnitState> eligible = RegulationAllocator.eligible(
                    unitsByArea.getOrDefault(area.areaId(), List.of()), flagged, excluded);
            if (interlock.get(area.areaId()).resumedNow()) {
                area.resume(eligible, ace.aceMw());
            }
            AreaCycleResult r = area.regulate(ace, eligible, excluded, in.nowMs(), notes);
            results.add(r);
            double filteredAceMw = r.regulation() != null ? r.regulation().filteredAceMw() : Double.NaN;
            for (PlannedCommand c : following.probes(unitsByArea.getOrDefault(area.areaId(), List.of()),
                    filteredAceMw, in.nowMs(), pulses, decisions)) {
                commands.add(c);
                remember(byId.get(c.unitId()), c, in.nowMs());
            }
            if (r.allocation() == null) {
                continue;
            }
            for (UnitAllocation ua : r.allocation().units()) {
                UnitState u = byId.get(ua.unitId());
                PulseOutcome p = pulses.plan(u, ua.targetMw(), in.nowMs(), settings.cycleMs());
                if (p.sends()) {
                    PlannedCommand c = p.command();
                    commands.add(c);
                    following.onCommand(u, c, in.nowMs());
                    remember(u, c, in.nowMs());
                }
            }
        }
        return new CycleOutcome(in.cycleNumber(), in.nowMs(), state, reasons, results, commands, checks,
                notes, decisions, following.flaggedUnits(), List.copyOf(interlock.values()));
    }

    private void remember(UnitState u, PlannedCommand c, long nowMs) {
        lastCommands.put(u.unitId(), new LastCommand(nowMs + c.durationMs(), u.setpointMw() + c.deltaMw()));
    }

    /** While a unit's telemetry predates the end of our last command to it, use the commanded setpoint. */
    private List<UnitState> effectiveUnits(List<UnitState> reported) {
        List<UnitState> out = new ArrayList<>(reported.size());
        for (UnitState u : reported) {
            LastCommand c = lastCommands.get(u.unitId());
            if (c != null && u.telemetryTimeMs() < c.endMs() + settings.commandSettleMs()) {
                out.add(u.withSetpointMw(c.setpointMw()));
            } else {
                out.add(u);
            }
        }
        return out;
    }

    /**
     * A command of an earlier cycle did not land: refused by the unit, failed to publish,
     * back-pressured or not signable. It does not count as a move: the unit's reported setpoint is
     * used again at once, the following check forgets the move and the area's next integration is
     * withheld. A refusal as from a stale epoch (another controller instance has taken over)
     * suspends this controller for good with reason {@code staleEpoch:{unit}}. After
     * {@code missedCyclesToFlag} commands in a row to a unit that did not land, the unit leaves the
     * allocation ({@code unitExcluded}, reason {@code commandsNotExecuted:{reason}}) until a probe
     * brings it back: its command path cannot be counted on.
     *
     * @param unitId     unit the command was for
     * @param deltaMw    the move the command carried, MW
     * @param reasonCode stable code, e.g. {@code wrongEpoch}, {@code atLimit}, {@code publishFailed},
     *                   {@code unsignable}
     */
    public void commandNotExecuted(String unitId, double deltaMw, String reasonCode) {
        lastCommands.remove(unitId);
        following.withdraw(unitId, deltaMw);
        String areaId = unitAreas.get(unitId);
        if (areaId != null && areas.containsKey(areaId)) {
            areas.get(areaId).onMoveNotExecuted();
        }
        if (notExecuted.size() < 1000) {
            notExecuted.add("commandNotExecuted:" + unitId + ":" + reasonCode);
        }
        if ("wrongEpoch".equals(reasonCode) && supersededEpochReason == null) {
            supersededEpochReason = "staleEpoch:" + unitId;
        }
        int inRow = failedInRow.merge(unitId, 1, Integer::sum);
        if (inRow >= settings.following().missedCyclesToFlag() && areaId != null) {
            FollowingDecision d = following.excludeForFailedCommands(unitId, areaId, lastCycleMs, inRow, reasonCode);
            if (d != null) {
                pendingDecisions.add(d);
            }
        }
    }

    /** A command to the unit was accepted: its run of commands that did not land ends. */
    public void commandAccepted(String unitId) {
        failedInRow.remove(unitId);
    }

    /** Operator reset of a unit flagged as not following: it returns to the allocation at once. */
    public void resetFollowing(String unitId) {
        following.reset(unitId);
    }

    /** @return base points of an area's units, MW */
    public Map<String, Double> basePointsMw(String areaId) {
        return area(areaId).basePointsMw();
    }

    /** Set a unit's base point, e.g. from an operator schedule, MW. */
    public void setBasePoint(String areaId, String unitId, double mw) {
        area(areaId).setBasePoint(unitId, mw);
    }

    public ControlCycleSettings settings() {
        return settings;
    }

    private AreaController area(String areaId) {
        AreaController a = areas.get(areaId);
        if (a == null) {
            throw new IllegalArgumentException("no area " + areaId);
        }
        return a;
    }
}
