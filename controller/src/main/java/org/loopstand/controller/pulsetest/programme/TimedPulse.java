package org.loopstand.controller.pulsetest.programme;

import org.loopstand.protocol.message.PulseDirection;

/**
 * One pulse of the programme.
 *
 * @param atOffsetMs time to send it, ms after the programme start
 * @param direction  raise or lower
 * @param durationMs pulse length, ms, in [1, 600000]
 */
public record TimedPulse(long atOffsetMs, PulseDirection direction, long durationMs) {
    /** @return when the pulse stops acting, ms after the programme start */
    public long endOffsetMs() {
        return atOffsetMs + durationMs;
    }
}
