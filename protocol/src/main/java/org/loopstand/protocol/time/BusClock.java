package org.loopstand.protocol.time;

import org.loopstand.protocol.message.ClockTick;

/**
 * Scenario time followed from the plant's clock ticks ({@code --clock bus}): the latest tick's
 * source time (the plant's scenario epoch ms) and rate, extrapolated between ticks with an
 * injected wall clock. A tick a little behind the extrapolation (up to
 * {@value #RESTART_BEHIND_MS} ms of scenario time) holds time until it catches up. A tick further
 * behind is a restarted plant (the rig's plant numbers its ticks from its start, epoch ms, so a
 * restarted plant's ticks number above the old ones), unless its seq is up to
 * {@value #LATE_SEQ_WINDOW} below the last one taken: that is an old tick delivered late, e.g. from a
 * broker's queue after a partition healed, and is ignored. On a restart {@link #epochMillis()} follows it back to the plant's time, so
 * commands and ages are reckoned on the plant's clock again, while {@link #monotonicNanos()} keeps
 * running forward (it moves on by the whole seconds it was ahead, rounded up, so cycle starts stay
 * on whole scenario seconds). A stopped scenario ({@code running = false}) holds time. Thread-safe.
 */
public final class BusClock implements Clock {
    private record Anchor(long scenarioEpochMs, long wallNanos, double rate) {
    }

    /** A tick further behind the extrapolation than this, scenario ms, is a restarted plant. */
    public static final long RESTART_BEHIND_MS = 10_000;
    /**
     * A tick at most this many numbers below the last one taken is a late copy; further below is a
     * publisher restarted to a lower number (as the intake's sequence rule, docs/controller.md).
     */
    public static final long LATE_SEQ_WINDOW = 1000;

    private final Clock wall;
    private volatile Anchor anchor;
    private long lastNanos = Long.MIN_VALUE;
    /** monotonic − scenario time, ns: grows by whole seconds at each restart followed */
    private long offsetNanos;
    private long restartsFollowed;
    private long lastSeq = Long.MIN_VALUE;
    private long lateTicksIgnored;

    /** @param wall the wall clock used between ticks */
    public BusClock(Clock wall) {
        this.wall = wall;
    }

    /** Takes a tick as the new anchor. */
    public synchronized void onTick(ClockTick tick) {
        Anchor a = anchor;
        if (a != null && tick.seq() < lastSeq && lastSeq - tick.seq() <= LATE_SEQ_WINDOW) {
            // an older tick delivered late (a broker's queue emptied after a partition healed): not a restart
            lateTicksIgnored++;
            return;
        }
        lastSeq = tick.seq();
        if (a != null) {
            long behindNanos = scenarioNanos(a) - tick.sourceTime() * 1_000_000L;
            if (behindNanos > RESTART_BEHIND_MS * 1_000_000L) {
                offsetNanos += Math.floorDiv(behindNanos + 999_999_999L, 1_000_000_000L) * 1_000_000_000L;
                restartsFollowed++;
            }
        }
        anchor = new Anchor(tick.sourceTime(), wall.monotonicNanos(), tick.running() ? tick.rate() : 0.0);
    }

    /** @return how many ticks were ignored because their seq was below one already taken (late copies) */
    public synchronized long lateTicksIgnored() {
        return lateTicksIgnored;
    }

    /** @return how many plant restarts (ticks far behind) this clock followed */
    public synchronized long restartsFollowed() {
        return restartsFollowed;
    }

    private long scenarioNanos(Anchor a) {
        return a.scenarioEpochMs() * 1_000_000L + (long) ((wall.monotonicNanos() - a.wallNanos()) * a.rate());
    }

    /** @return true once a tick has been received; before that the time is not known */
    public boolean synced() {
        return anchor != null;
    }

    /** @return the wall clock's monotonic time, ns (for what must go on while scenario time stands still) */
    public long wallNanos() {
        return wall.monotonicNanos();
    }

    /** @return the rate of the latest tick (0 while stopped or before the first tick) */
    public double rate() {
        Anchor a = anchor;
        return a == null ? 0.0 : a.rate();
    }

    /** The plant's scenario time, epoch ms (goes back once when a restarted plant is followed). */
    @Override
    public synchronized long epochMillis() {
        return Math.floorDiv(monotonicNanos() - offsetNanos, 1_000_000L);
    }

    /**
     * Scenario epoch time in ns plus the whole seconds of the restarts followed (so that cycle
     * starts align to whole scenario seconds); never goes back.
     */
    @Override
    public synchronized long monotonicNanos() {
        Anchor a = anchor;
        if (a == null) {
            return 0L;
        }
        long n = scenarioNanos(a) + offsetNanos;
        if (n < lastNanos) {
            return lastNanos;
        }
        lastNanos = n;
        return n;
    }
}
