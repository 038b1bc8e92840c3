package org.loopstand.controller.runtime;

import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.time.Clock;

/**
 * Scenario time followed from the plant's clock ticks ({@code --clock bus}): the latest tick's
 * source time (the plant's scenario epoch ms) and rate, extrapolated between ticks with an
 * injected wall clock. Never runs backwards: a tick behind the extrapolation holds time until it
 * catches up. A stopped scenario ({@code running = false}) holds time. Thread-safe.
 */
public final class BusClock implements Clock {
    private record Anchor(long scenarioEpochMs, long wallNanos, double rate) {
    }

    private final Clock wall;
    private volatile Anchor anchor;
    private long lastNanos = Long.MIN_VALUE;

    /** @param wall the wall clock used between ticks */
    public BusClock(Clock wall) {
        this.wall = wall;
    }

    /** Takes a tick as the new anchor. */
    public void onTick(ClockTick tick) {
        anchor = new Anchor(tick.sourceTime(), wall.monotonicNanos(), tick.running() ? tick.rate() : 0.0);
    }

    /** @return true once a tick has been received; before that the time is not known */
    public boolean synced() {
        return anchor != null;
    }

    /** @return the rate of the latest tick (0 while stopped or before the first tick) */
    public double rate() {
        Anchor a = anchor;
        return a == null ? 0.0 : a.rate();
    }

    @Override
    public long epochMillis() {
        return Math.floorDiv(monotonicNanos(), 1_000_000L);
    }

    /** Scenario epoch time in ns (so that cycle starts align to whole scenario seconds). */
    @Override
    public synchronized long monotonicNanos() {
        Anchor a = anchor;
        if (a == null) {
            return 0L;
        }
        long n = a.scenarioEpochMs() * 1_000_000L + (long) ((wall.monotonicNanos() - a.wallNanos()) * a.rate());
        if (n < lastNanos) {
            return lastNanos;
        }
        lastNanos = n;
        return n;
    }
}
