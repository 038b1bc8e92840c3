package org.loopstand.controller.pulsetest.analysis;

import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.protocol.message.PulseDirection;

/**
 * What the analyser needs to know about one measured step, in absolute times.
 *
 * @param label             step name
 * @param kind              step kind
 * @param direction         direction of the (first) move; null for a hold
 * @param startMs           window start = first pulse sent (or hold start), epoch ms
 * @param reverseMs         reversal: when the opposite pulses were sent, epoch ms; else −1
 * @param endMs             window end, epoch ms
 * @param requestedChangeMw change the pulses ask for, MW, signed (+ = raise)
 * @param pulseSeconds      pulse time sent in this step, s (direction-less total)
 */
public record StepWindow(String label, StepKind kind, PulseDirection direction, long startMs, long reverseMs,
        long endMs, double requestedChangeMw, double pulseSeconds) {
    /** @return +1 for raise, −1 for lower, 0 for a hold */
    public double sign() {
        return direction == null ? 0 : direction == PulseDirection.RAISE ? 1 : -1;
    }
}
