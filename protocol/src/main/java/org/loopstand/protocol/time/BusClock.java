package org.loopstand.protocol.time;

import org.loopstand.protocol.message.ClockTick;

/**
 * Scenario time followed from the plant's clock ticks ({@code --clock bus}): the latest tick's
 * source time (the plant's scenario epoch ms) and rate, extrapolated between ticks with an
 * injected wall clock, but at most {@value #EXTRAPOLATED_TICK_PERIODS} tick periods past the last
 * tick (the plant ticks every scenario second, or every wall second below rate 1): a plant whose
 * loop stalled holds its own clock (docs/plant.md, "Pacing"), so a controller running on far past
 * the last tick would only find its inputs stale and its commands ahead of the plant. Time then
 * stands still until the next tick. When no tick came for {@link #silentAfterWallNanos(double)} of
 * wall time (at least {@value #SILENT_AFTER_WALL_MS} ms) the time source is silent
 * ({@link #silentWallNanos()}: a partition, a plant gone): a controller's time ({@link WhenSilent#RUN_BLIND})
 * runs on blind at the last tick's rate from where it stood, so inputs age and the areas suspend on their
 * own staleness rules; a unit interface's time ({@link WhenSilent#STAND_STILL}) stands until the next tick,
 * so a stall of its own connection (a loaded broker node) is not taken for scenario time without the
 * controller's status, i.e. a watchdog the machine made. A tick a little behind the extrapolation (up to
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

    /** What the time does once the source is silent. */
    public enum WhenSilent {
        /** runs on at the last tick's rate from where it stood (a controller: its inputs age) */
        RUN_BLIND,
        /** stands where it stood until the next tick (a unit interface: its watchdog counts the plant's time only) */
        STAND_STILL
    }

    /** A tick further behind the extrapolation than this, scenario ms, is a restarted plant. */
    public static final long RESTART_BEHIND_MS = 10_000;
    /**
     * A tick at most this many numbers below the last one taken is a late copy; further below is a
     * publisher restarted to a lower number (as the intake's sequence rule, docs/controller.md).
     */
    public static final long LATE_SEQ_WINDOW = 1000;
    /** How far past the last tick time is extrapolated, in tick periods. */
    public static final int EXTRAPOLATED_TICK_PERIODS = 2;
    /** Shortest wall time without a tick (while the last said running) that makes the time source silent, ms. */
    public static final long SILENT_AFTER_WALL_MS = 2_000;
    /** The silence limit is at least this many tick periods (rate 1: 3 s of wall). */
    public static final int SILENT_AFTER_TICK_PERIODS = 3;

    private final Clock wall;
    private final WhenSilent whenSilent;
    private volatile Anchor anchor;
    private long lastNanos = Long.MIN_VALUE;
    /** monotonic − scenario time, ns: grows by whole seconds at each restart followed */
    private long offsetNanos;
    private long restartsFollowed;
    private long lastSeq = Long.MIN_VALUE;
    private long lateTicksIgnored;
    private long silences;
    /** wall ns the controller's own bus link went down (no tick can come), {@link Long#MAX_VALUE} while up */
    private volatile long linkDownWallNanos = Long.MAX_VALUE;
    /** the source was found silent since the current anchor (so the next tick ends a silence) */
    private volatile boolean silentSeen;
    /** wall ns the latest silence lasted, up to the tick that ended it */
    private long lastSilenceWallNanos;

    /** @param wall the wall clock used between ticks; time runs on blind once the source is silent */
    public BusClock(Clock wall) {
        this(wall, WhenSilent.RUN_BLIND);
    }

    /**
     * @param wall       the wall clock used between ticks
     * @param whenSilent what the time does once the source is silent
     */
    public BusClock(Clock wall, WhenSilent whenSilent) {
        this.wall = wall;
        this.whenSilent = java.util.Objects.requireNonNull(whenSilent, "whenSilent");
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
        if (a != null && (silentWallNanos(a) > 0 || silentSeen)) {
            silences++;
            lastSilenceWallNanos = wall.monotonicNanos() - a.wallNanos();
        }
        silentSeen = false;
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

    /** @return wall ns between two ticks of a plant at {@code rate} (one scenario second, at most one wall second) */
    public static long tickPeriodWallNanos(double rate) {
        return rate >= 1 ? Math.round(1e9 / rate) : 1_000_000_000L;
    }

    /** @return wall ns without a tick after which the time source at {@code rate} is silent */
    public static long silentAfterWallNanos(double rate) {
        return Math.max(SILENT_AFTER_WALL_MS * 1_000_000L, SILENT_AFTER_TICK_PERIODS * tickPeriodWallNanos(rate));
    }

    /** @return wall ns past the last tick that the time is extrapolated at {@code rate} */
    private static long extrapolationCapWallNanos(double rate) {
        return EXTRAPOLATED_TICK_PERIODS * tickPeriodWallNanos(rate);
    }

    private long scenarioNanos(Anchor a) {
        long base = a.scenarioEpochMs() * 1_000_000L;
        if (a.rate() <= 0) {
            return base;
        }
        long w = wall.monotonicNanos();
        long elapsed = w - a.wallNanos();
        long capWall = extrapolationCapWallNanos(a.rate());
        if (elapsed <= capWall) {
            return base + (long) (elapsed * a.rate());
        }
        // stands at the cap until the source is silent, then runs on blind from there (never a jump)
        long blindWall = whenSilent == WhenSilent.RUN_BLIND ? Math.max(0, w - silentAtWallNanos(a, capWall)) : 0;
        return base + (long) ((capWall + blindWall) * a.rate());
    }

    /** @return wall ns from which the source behind anchor {@code a} is silent: the limit, or at once when the link is down */
    private long silentAtWallNanos(Anchor a, long capWall) {
        long silentAt = a.wallNanos() + silentAfterWallNanos(a.rate());
        long down = linkDownWallNanos;
        return down == Long.MAX_VALUE ? silentAt : Math.min(silentAt, Math.max(down, a.wallNanos() + capWall));
    }

    private long silentWallNanos(Anchor a) {
        if (a == null || a.rate() <= 0) {
            return 0;
        }
        long w = wall.monotonicNanos();
        if (w < silentAtWallNanos(a, extrapolationCapWallNanos(a.rate()))) {
            return 0;
        }
        silentSeen = true;
        return w - a.wallNanos();
    }

    /**
     * Any thread: the controller's own bus link went down ({@code up} false) or came back. While it is down
     * no tick can come, so the source counts as silent at once (after the two tick periods' extrapolation)
     * instead of after the silence limit: cycles run on blind and suspend for the link ({@code busLinkDown}).
     */
    public void linkUp(boolean up) {
        if (up) {
            silentWallNanos(anchor); // a silence while it was down ends with the next tick, not with the link
        }
        linkDownWallNanos = up ? Long.MAX_VALUE : wall.monotonicNanos();
    }

    /**
     * @return wall ns since the last tick when the time source is silent (no tick for the silence limit while
     *         the last one said running), else 0
     */
    public long silentWallNanos() {
        return silentWallNanos(anchor);
    }

    /**
     * @return true while the time stands waiting for the plant's next tick: before the first, or past the
     *         extrapolation of a running one (and, when it runs blind, before the silence limit), i.e. when the
     *         next tick may move it on at once
     */
    public boolean standing() {
        Anchor a = anchor;
        if (a == null) {
            return true;
        }
        if (a.rate() <= 0) {
            return false; // the plant holds its clock: its time is known, it stands
        }
        long capWall = extrapolationCapWallNanos(a.rate());
        long w = wall.monotonicNanos();
        return w - a.wallNanos() > capWall && (whenSilent == WhenSilent.STAND_STILL || w < silentAtWallNanos(a, capWall));
    }

    /** @return how many silences a tick has ended */
    public synchronized long silencesEnded() {
        return silences;
    }

    /** @return wall ns the latest ended silence lasted (from the tick before it to the tick that ended it) */
    public synchronized long lastSilenceWallNanos() {
        return lastSilenceWallNanos;
    }

    /** @return the latest tick's scenario time, epoch ms (0 before the first) */
    public long lastTickEpochMs() {
        Anchor a = anchor;
        return a == null ? 0 : a.scenarioEpochMs();
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
