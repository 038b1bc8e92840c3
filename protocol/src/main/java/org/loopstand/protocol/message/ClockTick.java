package org.loopstand.protocol.message;

/**
 * Scenario clock as the scenario player runs it.
 *
 * @param seq            per-publisher sequence number, ≥ 0
 * @param sourceTime     epoch ms at the source, &gt; 0
 * @param scenarioTimeMs time since scenario start, ms, ≥ 0
 * @param rate           scenario seconds per wall second, in (0, 1000]
 * @param running        whether the scenario clock runs
 */
public record ClockTick(long seq, long sourceTime, long scenarioTimeMs, double rate, boolean running) {
}
