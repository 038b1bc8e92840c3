package org.loopstand.plant.runtime;

import java.util.List;
import java.util.Set;
import java.util.TreeSet;

import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;

/**
 * The scenario clock of a run: stands still at its start until {@link #release()}, then runs at its
 * rate (scenario time 0 is the release). A pace keeper may {@link #hold(String)} it mid-run under its
 * own name and {@link #letGo(String)} that hold; the clock runs only while no hold is in force, so one
 * holder letting go never lifts another's hold. {@link #runAt(double)} sets the rate it runs at (at
 * once when nothing holds it, else from the last hold's end); scenario time never jumps and never goes back.
 * Lets a plant connect everything and a controller join before scenario time starts to run, and
 * lets a plant that cannot keep the asked rate slow its clock instead of falling behind it.
 *
 * <p><b>Leash.</b> With {@link #leashTo(long)} the clock never reads more than the limit ahead of the
 * physics' time, which the plant loop tells it after every step ({@link #physicsAt(long)}). A reading
 * that would pass physics + limit (the loop stalled: a GC pause, a busy machine) holds the clock at
 * physics + limit, dated back to the wall instant it reached that point ({@link #leashHolds()}), as a
 * hold named {@value #LEASH}; the pace keeper lets go of it once the physics has caught up. So every reader (clock ticks, command
 * arrival stamps, expiry checks, journal) sees a time the physics is at most the limit behind, and a
 * stall costs scenario time (the clock stood still) instead of a stretch of physics run open loop.
 * Thread-safe.
 */
public final class HeldStartClock implements Clock {
    /** Name of the hold the clock takes itself when it reaches the leash. */
    public static final String LEASH = "leash";

    /** From {@code wallNanos} on, scenario time runs at {@code rate} from {@code scenarioNanos}; rate 0 = held. */
    private record Segment(long scenarioNanos, long wallNanos, double rate) {
    }

    private final Clock wall;
    private final double rate;
    private final long startEpochMs;
    private volatile Segment segment;
    /** rate of the latest running segment (the asked rate until the pace keeper changes it) */
    private volatile double lastRunningRate;
    /** longest lead of the clock over the physics, ns; {@link Long#MAX_VALUE} = no leash */
    private volatile long leashNanos = Long.MAX_VALUE;
    /** the physics' time on this clock's scale, ns; {@link Long#MIN_VALUE} until the loop tells it */
    private volatile long physicsNanos = Long.MIN_VALUE;
    private volatile long leashHolds;
    /** wall instant the latest leash hold began (the clock reached physics + limit), ns */
    private volatile long leashHoldWallNanos;
    /** names of the holds in force; guarded by this */
    private final Set<String> holds = new TreeSet<>();

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

    /** Starts scenario time at the asked rate, held if a hold is already in force (later calls do nothing). */
    public synchronized void release() {
        if (segment == null) {
            segment = new Segment(0L, wall.monotonicNanos(), holds.isEmpty() ? lastRunningRate : 0.0);
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

    /**
     * Holds scenario time where it is now under {@code holder}'s name, until that holder lets go (a hold
     * already in force under that name stays as it is). Before the release the hold is kept for it.
     *
     * @param holder who holds, e.g. the pace keeper's name; not {@value #LEASH}
     */
    public synchronized void hold(String holder) {
        if (holder == null || holder.isEmpty() || holder.equals(LEASH)) {
            throw new IllegalArgumentException("a hold needs a name of its own, got " + holder);
        }
        holds.add(holder);
        freeze();
    }

    /**
     * {@code holder}'s hold ends (nothing if it holds none); the clock runs on from where it stands at the
     * rate in force once no other hold is left. The pace keeper also lets go of {@value #LEASH}.
     */
    public synchronized void letGo(String holder) {
        if (holds.remove(holder) && holds.isEmpty()) {
            Segment s = segment;
            if (s != null && s.rate() == 0) {
                segment = new Segment(s.scenarioNanos(), wall.monotonicNanos(), lastRunningRate);
            }
        }
    }

    /** @return the names of the holds in force, in name order (empty while nothing holds the clock) */
    public synchronized List<String> holdsInForce() {
        return List.copyOf(holds);
    }

    /** @return true while {@code holder}'s hold is in force */
    public synchronized boolean heldBy(String holder) {
        return holds.contains(holder);
    }

    private void freeze() {
        Segment s = segment;
        if (s != null && s.rate() > 0) {
            long w = wall.monotonicNanos();
            segment = new Segment(Math.min(scenarioNanos(s, w), leashCap()), w, 0.0);
        }
    }

    /**
     * Scenario time runs on at {@code newRate}: from where it is now when no hold is in force, else from
     * the end of the last hold; does nothing to the time before the release.
     *
     * @param newRate scenario seconds per wall second, (0, {@value AcceleratedClock#MAX_RATE}]
     */
    public synchronized void runAt(double newRate) {
        checkRate(newRate);
        lastRunningRate = newRate;
        Segment s = segment;
        if (s != null && holds.isEmpty()) {
            long w = wall.monotonicNanos();
            segment = new Segment(Math.min(scenarioNanos(s, w), leashCap()), w, newRate);
        }
    }

    /**
     * From now on the clock reads at most {@code limitNanos} ahead of the physics' time (once the loop
     * has told it, {@link #physicsAt}).
     *
     * @param limitNanos scenario ns, &gt; 0
     */
    public void leashTo(long limitNanos) {
        if (limitNanos <= 0) {
            throw new IllegalArgumentException("leash must be a positive number of scenario ns, got " + limitNanos);
        }
        this.leashNanos = limitNanos;
    }

    /**
     * Loop thread, after every step: the time the physics has reached, on this clock's scale (the
     * monotonic reading the step was due at).
     *
     * @param nanos scenario ns
     */
    public void physicsAt(long nanos) {
        physicsNanos = nanos;
    }

    /** @return how many times the clock reached the leash and held (a count the pace keeper watches) */
    public long leashHolds() {
        return leashHolds;
    }

    /** @return wall ns at which the latest leash hold began (the clock reached physics + limit) */
    public long leashHoldWallNanos() {
        return leashHoldWallNanos;
    }

    /** @return the leash, scenario ns ({@link Long#MAX_VALUE} when none) */
    public long leashNanos() {
        return leashNanos;
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

    /** @return physics + leash, scenario ns ({@link Long#MAX_VALUE} without a leash or before the physics told) */
    private long leashCap() {
        long p = physicsNanos;
        long l = leashNanos;
        return p == Long.MIN_VALUE || l == Long.MAX_VALUE ? Long.MAX_VALUE : p + l;
    }

    @Override
    public long monotonicNanos() {
        Segment s = segment;
        if (s == null) {
            return 0L;
        }
        long n = scenarioNanos(s, wall.monotonicNanos());
        long cap = leashCap();
        return n <= cap ? n : holdAtLeash();
    }

    /** The clock passed physics + limit: it holds there, dated back to the wall instant it got there. */
    private synchronized long holdAtLeash() {
        Segment s = segment;
        long w = wall.monotonicNanos();
        long n = scenarioNanos(s, w);
        long cap = leashCap();
        if (n <= cap) {
            return n; // another reader held it, or the physics moved on meanwhile
        }
        // never back: a clock already held (rate 0) beyond the cap stays where it stands
        long at = Math.max(cap, s.scenarioNanos());
        long reachedWall = s.rate() > 0 ? s.wallNanos() + (long) ((at - s.scenarioNanos()) / s.rate()) : w;
        if (s.rate() > 0) {
            holds.add(LEASH);
            segment = new Segment(at, Math.min(w, Math.max(s.wallNanos(), reachedWall)), 0.0);
            leashHoldWallNanos = segment.wallNanos();
            leashHolds++;
        }
        return at;
    }
}
