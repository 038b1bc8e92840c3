package org.loopstand.controller.cycle;

/**
 * @param cycleNumber          n in {@code start_n = t0 + n·period}
 * @param scheduledStartNanos  start_n, clock monotonic nanos
 * @param actualStartNanos     when the cycle really started, clock monotonic nanos
 * @param jitterNanos          actual − scheduled, ≥ 0
 * @param missedBefore         cycles skipped since the previous tick (their start had passed)
 */
public record CycleTick(long cycleNumber, long scheduledStartNanos, long actualStartNanos, long jitterNanos,
                        long missedBefore) {
}
