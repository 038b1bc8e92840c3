package org.loopstand.controller.cycle;

import java.util.List;
import org.loopstand.controller.safety.InterlockDecision;
import org.loopstand.controller.safety.InterlockState;

/**
 * Whether one area may be regulated after this cycle, and why not.
 *
 * @param areaId           area id
 * @param decision         this area's interlock decision (state, this cycle's reasons, resumedNow,
 *                         suspendedNow)
 * @param reasons          while suspended: this cycle's reasons, or those of the suspension while
 *                         the area waits out its clear cycles ({@code notStarted} before it first
 *                         regulated); empty while regulating
 * @param detail           the figures behind the reasons, e.g. {@code frequency:north frozen ageMs=1200};
 *                         empty while regulating
 * @param suspendedSinceMs controller time the area was last suspended, epoch ms; 0 while regulating
 */
public record AreaInterlockState(String areaId, InterlockDecision decision, List<String> reasons, String detail,
                                 long suspendedSinceMs) {
    public AreaInterlockState {
        reasons = List.copyOf(reasons);
    }

    public boolean mayCommand() {
        return decision.mayCommand();
    }

    public InterlockState state() {
        return decision.state();
    }

    public boolean suspendedNow() {
        return decision.suspendedNow();
    }

    public boolean resumedNow() {
        return decision.resumedNow();
    }
}
