package org.loopstand.controller.pulsetest.plan;

import org.loopstand.protocol.config.SourceLocation;
import org.loopstand.protocol.message.PulseDirection;

/**
 * One step of a test plan as written.
 *
 * @param kind      what the step does
 * @param at        where the step is written in the plan file, for messages
 * @param label     name shown in the results (defaults to the kind and direction)
 * @param direction raise or lower (first direction for a reversal); null for hold
 * @param size      move size (staircase, reversal) or margin from the limit (rampToLimit); null otherwise
 * @param count     number of moves (staircase) or pulses (shortPulses), ≥ 1; 1 otherwise
 * @param durationS hold length, s (hold only), &gt; 0; 0 otherwise
 * @param pulseMs   short pulse length, ms (shortPulses only), in [1, 600000]; 0 otherwise
 */
public record PlanStep(StepKind kind, SourceLocation at, String label, PulseDirection direction, StepSize size, int count,
        double durationS, long pulseMs) {
}
