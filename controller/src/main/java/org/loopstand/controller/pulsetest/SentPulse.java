package org.loopstand.controller.pulsetest;

import org.loopstand.protocol.message.PulseDirection;

/**
 * A pulse the test sent.
 *
 * @param seq        command seq
 * @param sentMs     when it was published, epoch ms on the test's clock
 * @param stepIndex  programme step it belongs to
 * @param direction  raise or lower
 * @param durationMs pulse length, ms
 */
public record SentPulse(long seq, long sentMs, int stepIndex, PulseDirection direction, long durationMs) {
}
