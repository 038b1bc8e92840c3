package org.loopstand.protocol.time;

/** Real time: scenario time equals wall time. */
public final class WallClock implements Clock {
    public static final WallClock INSTANCE = new WallClock();

    private WallClock() {
    }

    @Override
    public long epochMillis() {
        return SystemTime.wallEpochMillis();
    }

    @Override
    public long monotonicNanos() {
        return SystemTime.wallMonotonicNanos();
    }

    @Override
    public String toString() {
        return "wall clock";
    }
}
