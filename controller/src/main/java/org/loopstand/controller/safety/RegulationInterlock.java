package org.loopstand.controller.safety;

import org.loopstand.controller.config.InterlockSettings;

import java.util.List;

/**
 * Suspends regulation when an input it needs is bad and resumes it only after a run of clear
 * cycles. Pure state machine, one call per cycle; starts SUSPENDED (nothing is sent before the
 * inputs have been seen clear {@code resumeAfterClearCycles} times).
 * <pre>
 *   REGULATING --any reason--> SUSPENDED (suspendedNow)
 *   SUSPENDED  --no reason for N cycles in a row--> REGULATING (resumedNow)
 *   SUSPENDED  --a reason--> SUSPENDED, clear count back to 0
 * </pre>
 * The hold time of an input is applied before, in the intake: a held value counts as usable.
 */
public final class RegulationInterlock {
    private final InterlockSettings settings;
    private InterlockState state = InterlockState.SUSPENDED;
    private int clearCycles;
    private List<String> lastSuspendReasons = List.of("notStarted");

    public RegulationInterlock(InterlockSettings settings) {
        this.settings = settings;
    }

    public InterlockDecision evaluate(InterlockCheck check) {
        List<String> reasons = check.reasons();
        if (!reasons.isEmpty()) {
            boolean now = state == InterlockState.REGULATING;
            state = InterlockState.SUSPENDED;
            clearCycles = 0;
            lastSuspendReasons = reasons;
            return new InterlockDecision(state, reasons, false, now, 0);
        }
        if (state == InterlockState.REGULATING) {
            return new InterlockDecision(state, List.of(), false, false, 0);
        }
        clearCycles++;
        if (clearCycles >= settings.resumeAfterClearCycles()) {
            state = InterlockState.REGULATING;
            clearCycles = 0;
            lastSuspendReasons = List.of();
            return new InterlockDecision(state, List.of(), true, false, 0);
        }
        return new InterlockDecision(state, List.of(), false, false, clearCycles);
    }

    public InterlockState state() { return state; }
    public InterlockSettings settings() { return settings; }
    /** @return the reasons of the last suspension while suspended (empty while regulating) */
    public List<String> lastSuspendReasons() { return lastSuspendReasons; }
}
