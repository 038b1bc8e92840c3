package org.loopstand.controller.safety;

import java.util.List;

/**
 * @param state           regulating or suspended after this cycle
 * @param reasons         bad conditions found this cycle (empty when clear), stable codes
 * @param resumedNow      true on the one cycle where the state went back to regulating: the caller
 *                        must make the regulator track the present unit positions (bumpless)
 * @param suspendedNow    true on the cycle where regulation was suspended
 * @param clearCycles     consecutive clear cycles so far (while suspended)
 */
public record InterlockDecision(InterlockState state, List<String> reasons, boolean resumedNow,
                                boolean suspendedNow, int clearCycles) {
    public InterlockDecision {
        reasons = List.copyOf(reasons);
    }

    public boolean mayCommand() {
        return state == InterlockState.REGULATING;
    }
}
