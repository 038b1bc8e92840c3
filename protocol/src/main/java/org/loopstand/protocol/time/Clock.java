package org.loopstand.protocol.time;

/**
 * The one time source of the rig. Domain code never reads the system clock; it is handed a
 * {@code Clock} through its constructor so the same code runs in real time, accelerated or lockstep.
 *
 * <p>{@link #epochMillis()} is scenario time as epoch milliseconds (what goes into {@code sourceTime}
 * on the wire); {@link #monotonicNanos()} is a monotonic reading in nanoseconds on the same time base
 * (scenario nanoseconds), for durations and scheduling. Both advance at the clock's rate.
 */
public interface Clock {
    /** @return scenario time, epoch milliseconds. */
    long epochMillis();

    /** @return monotonic scenario time in nanoseconds; only differences are meaningful. */
    long monotonicNanos();
}
