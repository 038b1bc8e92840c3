package org.loopstand.plant.runtime;

import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;

/**
 * The scenario clock of a run: stands still at its start until {@link #release()}, then runs at its
 * rate (scenario time 0 is the release). A pace keeper may {@link #hold()} it mid-run and let it
 * run on at another rate ({@link #runAt(double)}); scenario time never jumps and never goes back.
 * Lets a plant connect everything and a controller join before scenario time starts to run, and
 * lets a plant that cannot keep the asked rate slow its clock instead of falling behind it.
 * Thread-safe.
 */
public final class HeldStartClock implements Clock {
    /** From {@code wallNanos} on, scenario time runs at {@code rate} from {@code scenarioNanos}; rate 0 = held. */
    private record Segment(long scenarioNanos, long wallNanos, double rate) {
    }

    private final Clock wall;
    private final double rate;
    private final long startEpochMs;
    private volatile Segment segment;
    /** rate of the latest running segment (the asked rate until the pace keeper changes it) */
    private volatile double lastRunningRate;

    /**
     * @param wall the wall clock underneath
     * @param rate scenario seconds per wall second, (0, {@value AcceleratedClock#MAX_RATE}]
     */
    public HeldStartClock(Clock wall, double rate) {
        checkRate(rate);
        this.wall = wall;
        this.rate = rate;
        this.lastRunningRate = rate;
        this.startEpochMs = wall.epochMillis();
    }

    private static void checkRate(double rate) {
        if (!(rate > 0.0) || rate > AcceleratedClock.MAX_RATE) {
            throw new IllegalArgumentException("rate must be in (0, " + AcceleratedClock.MAX_RATE + "], got " + rate);
        }
    }

    /** Starts scenario time at the asked rate (later calls do nothing). */
    public synchronized void release() {
        if (segment == null) {
            segment = new Segment(0L, wall.monotonicNanos(), rate);
        }
    }

    /** @return true once released */
    public boolean released() {
        return segment != null;
    }

    /** @return true while scenario time runs: released and not held */
    public boolean running() {
        Segment s = segment;
        return s != null && s.rate() > 0;
    }

    /** Holds scenario time where it is now (does nothing before the release or while held). */
    public synchronized void hold() {
        Segment s = segment;
        if (s != null && s.rate() > 0) {
            long w = wall.monotonicNanos();
            segment = new Segment(scenarioNanos(s, w), w, 0.0);
        }
    }

    /**
     * Lets scenario time run on from where it is at {@code newRate} (from a hold or at another
     * rate); does nothing before the release.
     *
     * @param newRate scenario seconds per wall second, (0, {@value AcceleratedClock#MAX_RATE}]
     */
    public synchronized void runAt(double newRate) {
        checkRate(newRate);
        Segment s = segment;
        if (s != null) {
            long w = wall.monotonicNanos();
            segment = new Segment(scenarioNanos(s, w), w, newRate);
            lastRunningRate = newRate;
        }
    }

    /** @return the asked rate, scenario seconds per wall second */
    public double rate() {
        return rate;
    }

    /** @return the rate scenario time runs at now, or ran at before a hold (never 0) */
    public double currentRate() {
        return lastRunningRate;
    }

    private static long scenarioNanos(Segment s, long wallNanos) {
        return s.scenarioNanos() + (long) ((wallNanos - s.wallNanos()) * s.rate());
    }

    @Override
    public long epochMillis() {
        return startEpochMs + Math.floorDiv(monotonicNanos(), 1_000_000L);
    }

    @Override
    public long monotonicNanos() {
        Segment s = segment;
        return s == null ? 0L : scenarioNanos(s, wall.monotonicNanos());
    }
}
