package org.loopstand.controller.pulsetest;

/**
 * One good frequency reading of the tested unit's area.
 *
 * @param tMs         when it arrived, epoch ms on the test's clock
 * @param frequencyHz measured frequency, Hz
 */
public record FrequencyPoint(long tMs, double frequencyHz) {
}
