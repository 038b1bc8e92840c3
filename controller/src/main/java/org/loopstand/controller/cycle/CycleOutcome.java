package org.loopstand.controller.cycle;

import java.util.List;
import org.loopstand.controller.following.FollowingCheck;
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
 * @param notes       other things worth reporting, e.g. {@code redispatchInfeasible:areaA}
 */
public record CycleOutcome(long cycleNumber, long nowMs, InterlockState state, List<String> reasons,
                           List<AreaCycleResult> areas, List<PlannedCommand> commands,
                           List<FollowingCheck> following, List<String> notes) {
    public CycleOutcome {
        reasons = List.copyOf(reasons);
        areas = List.copyOf(areas);
        commands = List.copyOf(commands);
        following = List.copyOf(following);
        notes = List.copyOf(notes);
    }
}
