package org.loopstand.controller.pulsetest.programme;

import java.util.List;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.protocol.message.PulseDirection;

/**
 * One measured segment of the programme: its pulses and the window its response is judged over.
 *
 * @param index                 0-based position in the programme
 * @param label                 name for the results, e.g. {@code staircase raise 2/3}
 * @param kind                  plan step kind it came from
 * @param direction             direction of the (first) move; null for a hold
 * @param startOffsetMs         window start, ms after programme start (= first pulse for a move)
 * @param endOffsetMs           window end, ms after programme start
 * @param pulses                pulses to send, in time order (empty for a hold)
 * @param requestedChangeMw     net load reference change the pulses ask for, MW, signed (+ = raise)
 * @param expectedStartMw       expected output at the window start, MW
 * @param expectedMoveMs        expected time from the first pulse until the output arrives, ms
 * @param expectedRampMwPerMin  expected achieved ramp: the slower of the declared ramp and the pulse
 *                              train's average reference rate, MW/min (0 for a hold)
 * @param reverseAtOffsetMs     for a reversal, when the opposite pulses start, ms after programme start; else −1
 */
public record ProgrammeStep(int index, String label, StepKind kind, PulseDirection direction, long startOffsetMs,
        long endOffsetMs, List<TimedPulse> pulses, double requestedChangeMw, double expectedStartMw,
        long expectedMoveMs, double expectedRampMwPerMin, long reverseAtOffsetMs) {
    public ProgrammeStep {
        pulses = List.copyOf(pulses);
    }

    /** @return total pulse time sent in this step, s */
    public double pulseSeconds() {
        return pulses.stream().mapToLong(TimedPulse::durationMs).sum() / 1000.0;
    }

    /** @return expected output at the end of the window, MW */
    public double expectedEndMw() {
        return expectedStartMw + requestedChangeMw;
    }
}
