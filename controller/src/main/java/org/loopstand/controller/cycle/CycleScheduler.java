package org.loopstand.controller.cycle;

import java.util.Optional;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.Recorder;
import org.loopstand.protocol.time.Clock;

/**
 * Fixed-rate cycle timing without drift: cycle n starts at {@code t0 + n·period} on the clock's
 * monotonic time, whatever the previous cycles took. If the runner wakes after one or more starts
 * have passed, it runs the latest due cycle and counts the skipped ones (a late control cycle is
 * not caught up: stale work is worse than none). Start jitter (actual − scheduled, ns) goes into
 * an HdrHistogram {@link Recorder}. The scheduler never sleeps; the runner asks
 * {@link #nanosUntilNext()} and waits in its own way. Single caller thread.
 */
public final class CycleScheduler {
    private final Clock clock;
    private final long periodNanos;
    private final long t0Nanos;
    private final Recorder jitterRecorder = new Recorder(3);
    private long nextCycle;
    private long cyclesRun;
    private long cyclesMissed;

    /**
     * @param clock       injected clock (monotonic nanos are used)
     * @param periodNanos cycle period, ns, &gt; 0
     * @param t0Nanos     start of cycle 0, clock monotonic nanos
     */
    public CycleScheduler(Clock clock, long periodNanos, long t0Nanos) {
        if (clock == null) {
            throw new IllegalArgumentException("clock must not be null");
        }
        if (periodNanos <= 0) {
            throw new IllegalArgumentException("periodNanos must be > 0, was " + periodNanos);
        }
        this.clock = clock;
        this.periodNanos = periodNanos;
        this.t0Nanos = t0Nanos;
    }

    /** Cycle 0 starts at the next whole multiple of the period on the clock's time base. */
    public static CycleScheduler alignedTo(Clock clock, long periodNanos) {
        long now = clock.monotonicNanos();
        long t0 = Math.floorDiv(now + periodNanos - 1, periodNanos) * periodNanos;
        return new CycleScheduler(clock, periodNanos, t0);
    }

    /** @return scheduled start of the next cycle to run, monotonic nanos */
    public long nextStartNanos() {
        return t0Nanos + nextCycle * periodNanos;
    }

    /** @return ns until the next start (0 if due) */
    public long nanosUntilNext() {
        return Math.max(0, nextStartNanos() - clock.monotonicNanos());
    }

    /**
     * Start a cycle if one is due.
     *
     * @return the tick, or empty when the next start has not come yet
     */
    public Optional<CycleTick> poll() {
        long now = clock.monotonicNanos();
        long start = nextStartNanos();
        if (now < start) {
            return Optional.empty();
        }
        long latestDue = Math.floorDiv(now - t0Nanos, periodNanos);
        long missed = latestDue - nextCycle;
        long scheduled = t0Nanos + latestDue * periodNanos;
        long jitter = now - scheduled;
        jitterRecorder.recordValue(jitter);
        cyclesMissed += missed;
        cyclesRun++;
        nextCycle = latestDue + 1;
        return Optional.of(new CycleTick(latestDue, scheduled, now, jitter, missed));
    }

    /** @return jitter histogram since the previous call (ns); resets the interval */
    public Histogram takeJitterHistogram() {
        return jitterRecorder.getIntervalHistogram();
    }

    public long cyclesRun() { return cyclesRun; }
    public long cyclesMissed() { return cyclesMissed; }
    public long periodNanos() { return periodNanos; }
    public long t0Nanos() { return t0Nanos; }
}
