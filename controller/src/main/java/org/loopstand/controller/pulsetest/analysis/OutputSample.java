package org.loopstand.controller.pulsetest.analysis;

/**
 * One measured output reading.
 *
 * @param tMs      time received, epoch ms on the test's clock
 * @param outputMw measured output, MW
 */
public record OutputSample(long tMs, double outputMw) {
}
