package org.loopstand.controller.cycle;

import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import org.loopstand.controller.following.FollowingCheck;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.safety.InterlockState;

/**
 * Everything one cycle decided.
 *
 * @param cycleNumber cycle number
 * @param nowMs       controller time, epoch ms
 * @param state       regulating or suspended
 * @param reasons     suspension reasons (stable codes), empty while regulating
 * @param areas       per-area ACE, regulation and allocation
 * @param commands    commands to send now (empty while suspended)
 * @param following   unit-following checks of this cycle
 * @param notes       other things worth reporting, e.g. {@code redispatch:areaA:lambda=…},
 *                    {@code redispatchInfeasible:areaA:…}, {@code commandNotExecuted:U1:expired}
 * @param decisions   unit exclusions, re-admission probes and re-admissions of this cycle
 * @param excludedUnits units flagged as not following after this cycle, sorted
 * @param areaStates  each area's interlock state after this cycle (site order); empty when not
 *                    known (outcomes built by hand)
 */
public record CycleOutcome(long cycleNumber, long nowMs, InterlockState state, List<String> reasons,
                           List<AreaCycleResult> areas, List<PlannedCommand> commands,
                           List<FollowingCheck> following, List<String> notes, List<FollowingDecision> decisions,
                           Set<String> excludedUnits, List<AreaInterlockState> areaStates) {
    public CycleOutcome {
        reasons = List.copyOf(reasons);
        areas = List.copyOf(areas);
        commands = List.copyOf(commands);
        following = List.copyOf(following);
        notes = List.copyOf(notes);
        decisions = List.copyOf(decisions);
        excludedUnits = java.util.Collections.unmodifiableSet(new TreeSet<>(excludedUnits));
        areaStates = List.copyOf(areaStates);
    }

    /** @return the areas that may not be regulated after this cycle, site order */
    public List<AreaInterlockState> suspendedAreas() {
        return areaStates.stream().filter(a -> !a.mayCommand()).toList();
    }

    /** Without following decisions. */
    public CycleOutcome(long cycleNumber, long nowMs, InterlockState state, List<String> reasons,
                        List<AreaCycleResult> areas, List<PlannedCommand> commands,
                        List<FollowingCheck> following, List<String> notes) {
        this(cycleNumber, nowMs, state, reasons, areas, commands, following, notes, List.of(), Set.of(), List.of());
    }
}
