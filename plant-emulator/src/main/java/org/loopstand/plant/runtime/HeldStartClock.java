package org.loopstand.plant.runtime;

import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;

/**
 * A scenario clock that stands still at its start until {@link #release()}, then runs at its rate
 * (an {@link AcceleratedClock} from that moment, so scenario time 0 is the release). Lets a plant
 * connect everything and a controller join before scenario time starts to run. Thread-safe.
 */
public final class HeldStartClock implements Clock {
    private final Clock wall;
    private final double rate;
    private final long startEpochMs;
    private volatile AcceleratedClock running;

    /**
     * @param wall the wall clock underneath
     * @param rate scenario seconds per wall second, (0, {@value AcceleratedClock#MAX_RATE}]
     */
    public HeldStartClock(Clock wall, double rate) {
        if (!(rate > 0.0) || rate > AcceleratedClock.MAX_RATE) {
            throw new IllegalArgumentException("rate must be in (0, " + AcceleratedClock.MAX_RATE + "], got " + rate);
        }
        this.wall = wall;
        this.rate = rate;
        this.startEpochMs = wall.epochMillis();
    }

    /** Starts scenario time (later calls do nothing). */
    public synchronized void release() {
        if (running == null) {
            running = new AcceleratedClock(wall, rate, startEpochMs);
        }
    }

    /** @return true once released */
    public boolean released() {
        return running != null;
    }

    public double rate() {
        return rate;
    }

    @Override
    public long epochMillis() {
        AcceleratedClock c = running;
        return c == null ? startEpochMs : c.epochMillis();
    }

    @Override
    public long monotonicNanos() {
        AcceleratedClock c = running;
        return c == null ? 0L : c.monotonicNanos();
    }
}
