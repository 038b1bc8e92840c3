package org.loopstand.plant.runtime;

/**
 * When the plant publishes its scenario clock: at once for the first tick and whenever the clock
 * starts, holds or changes rate, and otherwise every {@value #PERIOD_SCENARIO_NANOS} ns of scenario
 * time or every wall second, whichever comes first. A controller following the clock extrapolates
 * between ticks at the tick's rate, so a change must reach it at once: a tick only once a wall
 * second left a controller's time standing still for {@code rate} scenario seconds after the
 * start (at rate 40, 40 s: units' watchdogs fired and commands expired). Loop thread only.
 */
public final class ClockTickSchedule {
    /** Longest scenario time between two ticks, ns (one scenario second). */
    public static final long PERIOD_SCENARIO_NANOS = 1_000_000_000L;

    private boolean published;
    private boolean lastRunning;
    private double lastRate;
    private long nextNanos;

    /**
     * Decides whether a tick is due now and, if so, takes it as published.
     *
     * @param nowNanos scenario clock reading, ns (stands still while held)
     * @param running  true while scenario time runs
     * @param rate     the rate the clock runs at (or ran at before a hold), &gt; 0
     * @return true when a tick must be published now
     */
    public boolean due(long nowNanos, boolean running, double rate) {
        boolean changed = !published || running != lastRunning || rate != lastRate;
        if (!changed && nowNanos < nextNanos) {
            return false;
        }
        published = true;
        lastRunning = running;
        lastRate = rate;
        // one scenario second, or one wall second when the rate is below 1
        long periodNanos = Math.max(1L, Math.min(PERIOD_SCENARIO_NANOS, Math.round(1e9 * rate)));
        nextNanos = nowNanos + periodNanos - Math.floorMod(nowNanos, periodNanos);
        return true;
    }
}
