package org.loopstand.protocol.time;

/**
 * A clock that moves only when told to: study mode and deterministic tests advance it step by step.
 * Not thread-safe for writers; readers on other threads see a consistent value (volatile).
 */
public final class VirtualClock implements Clock {
    private final long startEpochMillis;
    private volatile long nanos;

    /** @param startEpochMillis scenario time at nanos = 0, epoch ms */
    public VirtualClock(long startEpochMillis) {
        this.startEpochMillis = startEpochMillis;
    }

    @Override
    public long epochMillis() {
        return startEpochMillis + nanos / 1_000_000L;
    }

    @Override
    public long monotonicNanos() {
        return nanos;
    }

    /** @param deltaNanos ≥ 0 */
    public void advanceNanos(long deltaNanos) {
        if (deltaNanos < 0) {
            throw new IllegalArgumentException("a clock cannot go backwards: deltaNanos=" + deltaNanos);
        }
        nanos += deltaNanos;
    }

    /** @param deltaMillis ≥ 0 */
    public void advanceMillis(long deltaMillis) {
        advanceNanos(deltaMillis * 1_000_000L);
    }

    /** @return seconds elapsed since start, as a double. */
    public double elapsedSeconds() {
        return nanos / 1e9;
    }

    @Override
    public String toString() {
        return "virtual clock at " + elapsedSeconds() + " s";
    }
}
