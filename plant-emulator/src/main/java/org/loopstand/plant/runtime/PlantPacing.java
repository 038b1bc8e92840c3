package org.loopstand.plant.runtime;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.function.Consumer;

import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;

/**
 * The pace keeper: when the physics falls more than {@link PacingSettings#lagS()} of scenario time behind
 * the scenario clock, it holds the clock until the physics has caught up. When the catch-up ran at
 * less than {@value #CATCH_UP_MARGIN} × the rate (the loop itself cannot keep the rate), the clock
 * then runs on at a lower rate ({@link PacingSettings#slowFactor()} × the rate it ran at), journaled as
 * {@code paceSlowed}; when the catch-up was fast (the loop was held up once: a pause, a busy
 * machine) it runs on at the same rate, journaled as {@code paceHeld}; both with the figures. After {@link PacingSettings#calmWallS()} wall seconds without a lag above a quarter of
 * the limit it raises the rate again by the same factor, up to the asked rate ({@code paceRaised}).
 * So a machine that cannot keep the asked rate slows the scenario (the controller follows the clock
 * ticks, so both see the same, slower time) instead of running the physics late and reaching a
 * different verdict. At the end {@link #finish(double)} compares the rate kept over the run with the
 * asked one and says {@code RATE NOT KEPT} beyond {@link PacingSettings#notKeptFactor()}.
 *
 * <p>It also puts the clock on a leash of {@link PacingSettings#lagS()} ({@link HeldStartClock#leashTo}): the
 * clock never reads more than that ahead of the physics, so a stall of the loop (a GC pause, a busy
 * machine) holds the clock the moment the limit is reached, not after the next step ran with the
 * physics already far behind (at rate 40 a 0.5 s stall is 20 s of scenario time, which the physics
 * would otherwise run open loop while the controller's inputs went stale). When the physics has caught
 * up, the clock runs on from where it stood (it never jumps), at the same rate when the catch-up was
 * fast and slower when not, as after a hold; journaled as {@code paceSlipped} with the stall's wall ms,
 * the scenario seconds not run, the limit and the rates, counted in {@code paceSummary} and the end line.
 *
 * <p>It watches the command path too ({@link #onCommandArrived}): a command that arrives from the bus
 * with more than a share (default {@value #COMMAND_AGE_SHARE}) of its validity already gone (scenario time from its
 * {@code issuedAt} to its arrival) shows that controller, broker or link were held up for longer than the
 * rate allows, in wall time; holding the clock would not make it younger, so the clock runs on slower
 * ({@code paceSlowed} with {@code reason: commandPath}), at most once per {@value #COMMAND_PATH_SETTLE_WALL_S}
 * wall second (one hold-up delays a burst of commands). The cut is in proportion: the same wall time on
 * the way at the new rate would leave the command half the share's age ({@code from × share/2 × validity
 * / age}), at most {@value #MAX_COMMAND_PATH_CUT} × at once, so a machine that is slow for the rate is met
 * within a cycle or two, before the controller counts several commands in a row as not executed (a
 * verdict the rate would have changed). The rate is not raised again while commands still arrive older
 * than half the share. The physics' holds and slow-downs say {@code reason: physicsLag}.
 *
 * <p>{@link #onStep(long)} runs on the plant loop's thread (every step, through
 * {@link StepLateness#watchSteps}); it allocates only when it changes the clock. The other methods run
 * on the owner's thread.
 */
public final class PlantPacing {
    /** Name of its own hold on the scenario clock ({@link HeldStartClock#hold(String)}); a leash hold it lets go of as {@link HeldStartClock#LEASH}. */
    public static final String HOLD = "physicsLag";

    /** A catch-up faster than this many times the rate is a one-off hold-up: the rate is kept. */
    public static final double CATCH_UP_MARGIN = 2.0;

    /**
     * Default share of a command's validity gone on its way beyond which the command path is too slow for the
     * rate (0 = off). Half: at 4 s of validity, 2 s of scenario time, which at rate 40 is 50 ms of wall
     * time on the way; common practice, no source (docs/performance.md has the runs it was chosen by).
     */
    public static final double COMMAND_AGE_SHARE = 0.5;

    /** Deepest cut of the rate at one old command: to no less than this share of the rate it ran at. */
    public static final double MAX_COMMAND_PATH_CUT = 0.25;

    /** Wall seconds after a rate change in which an old command does not slow the clock again. */
    public static final double COMMAND_PATH_SETTLE_WALL_S = 1.0;

    /**
     * Lowest rate the command path slows the clock to: at real time the way commands take is the field's own,
     * and a slower clock would only hide it.
     */
    public static final double COMMAND_PATH_FLOOR_RATE = 1.0;

    /** Lowest rate the pace keeper slows to, scenario seconds per wall second. */
    public static final double MIN_RATE = 0.05;

    private final HeldStartClock clock;
    private final Clock wall;
    private final long stepNanos;
    private final PacingSettings settings;
    private final Consumer<Map<String, Object>> journal;
    private final long lagNanos;
    private final long calmNanos;

    private boolean holding;
    private long holdStartWallNanos;
    private long holdMaxLateNanos;
    private long lastChangeWallNanos;
    private long maxLateNanos;
    private long slowdowns;
    private long holds;
    private long raises;
    private long commandPathSlowdowns;
    private final CommandPathWatch commandPath = new CommandPathWatch(COMMAND_AGE_SHARE,
            Math.round(COMMAND_PATH_SETTLE_WALL_S * 1e9));
    private long heldWallNanos;
    private double lowestRate;
    private long goWallNanos = -1;
    /** leash holds of the clock already taken up */
    private long leashHoldsSeen;
    /** the current hold is the leash's (a stall), not one this keeper made */
    private boolean leashHold;
    private long slips;
    private long slipSlowdowns;
    private long slipWallNanos;
    private double notRunS;

    /**
     * @param clock     the scenario clock it holds and slows
     * @param wall      wall clock, for hold durations, calm time and the kept rate
     * @param stepNanos physics step, ns
     * @param settings  limits
     * @param journal   takes each {@code paceSlowed}/{@code paceRaised}/{@code paceSummary} entry
     *                  (e.g. {@link PlantAgent#noteEvent}); called on the loop's thread
     */
    public PlantPacing(HeldStartClock clock, Clock wall, long stepNanos, PacingSettings settings,
                       Consumer<Map<String, Object>> journal) {
        this.clock = clock;
        this.wall = wall;
        this.stepNanos = stepNanos;
        this.settings = settings;
        this.journal = journal;
        this.lagNanos = Math.round(settings.lagS() * 1e9);
        this.calmNanos = Math.round(settings.calmWallS() * 1e9);
        this.lowestRate = clock.rate();
        clock.leashTo(lagNanos);
        this.leashHoldsSeen = clock.leashHolds();
    }

    /** Watches the loop's steps from now on. */
    public PlantPacing watch(StepLateness lateness) {
        lateness.watchSteps(this::onStep);
        return this;
    }

    /** Owner thread: scenario time started now (the kept rate is reckoned from here). */
    public void started() {
        goWallNanos = wall.monotonicNanos();
        lastChangeWallNanos = goWallNanos;
    }

    /**
     * Loop thread, after every step.
     *
     * @param lateNanos how late the step ran against the clock, ns of scenario time, ≥ 0
     */
    public void onStep(long lateNanos) {
        if (lateNanos > maxLateNanos) {
            maxLateNanos = lateNanos;
        }
        if (!holding && clock.leashHolds() != leashHoldsSeen) {
            // the clock reached the leash (the loop stalled): it stands still until the physics caught up
            leashHoldsSeen = clock.leashHolds();
            if (clock.heldBy(HeldStartClock.LEASH)) {
                holding = true;
                leashHold = true;
                holdStartWallNanos = wall.monotonicNanos(); // the loop steps again from here: the catch-up's start
                holdMaxLateNanos = lateNanos;
            }
        }
        if (holding) {
            holdMaxLateNanos = Math.max(holdMaxLateNanos, lateNanos);
            if (lateNanos < stepNanos) {
                resumeSlower();
            }
            return;
        }
        if (lateNanos > lagNanos && clock.running()) {
            clock.hold(HOLD);
            holding = true;
            holdStartWallNanos = wall.monotonicNanos();
            holdMaxLateNanos = lateNanos;
            return;
        }
        double rate = clock.currentRate();
        if (rate < clock.rate() && lateNanos < lagNanos / 4 && clock.running()) { // not while another holds it
            long w = wall.monotonicNanos();
            if (w - lastChangeWallNanos >= calmNanos && commandPath.calmFor(w, calmNanos)) {
                double to = Math.min(clock.rate(), rounded(rate / settings.slowFactor()));
                clock.runAt(to);
                lastChangeWallNanos = w;
                raises++;
                journal.accept(entry("paceRaised", rate, to));
            }
        }
    }

    private void resumeSlower() {
        long w = wall.monotonicNanos();
        double from = clock.currentRate();
        long heldNanos = Math.max(1, w - holdStartWallNanos);
        // scenario ns caught up per wall ns while held: how fast the loop can go right now
        double catchUpRate = (double) holdMaxLateNanos / heldNanos;
        boolean slow = catchUpRate < CATCH_UP_MARGIN * from;
        double to = slow ? Math.max(MIN_RATE, rounded(from * settings.slowFactor())) : from;
        clock.runAt(to);
        clock.letGo(leashHold ? HeldStartClock.LEASH : HOLD);
        holding = false;
        if (leashHold) {
            leashHold = false;
            slipped(w, from, to, slow, catchUpRate);
            return;
        }
        heldWallNanos += w - holdStartWallNanos;
        if (slow) {
            slowedAt(w, to);
        } else {
            holds++;
        }
        Map<String, Object> e = entry(slow ? "paceSlowed" : "paceHeld", from, to);
        e.put("reason", "physicsLag");
        e.put("catchUpRate", rounded(catchUpRate));
        e.put("behindS", holdMaxLateNanos / 1e9);
        e.put("limitS", settings.lagS());
        e.put("heldWallMs", (w - holdStartWallNanos) / 1e6);
        journal.accept(e);
    }

    /** Counts a slow-down to {@code to} made at wall ns {@code w}. */
    private void slowedAt(long w, double to) {
        lastChangeWallNanos = w;
        slowdowns++;
        lowestRate = Math.min(lowestRate, to);
    }

    /** Journals a stall the leash caught: the clock stood from the instant it reached the leash until now. */
    private void slipped(long w, double from, double to, boolean slow, double catchUpRate) {
        long stoodWallNanos = Math.max(0, w - clock.leashHoldWallNanos());
        double notRun = stoodWallNanos / 1e9 * from;
        slips++;
        slipWallNanos += stoodWallNanos;
        notRunS += notRun;
        if (slow) {
            slowedAt(w, to);
            slipSlowdowns++;
        }
        Map<String, Object> e = entry("paceSlipped", from, to);
        e.put("reason", "physicsLag");
        e.put("stallWallMs", stoodWallNanos / 1e6);
        e.put("notRunS", Math.round(notRun * 1000) / 1000.0);
        e.put("limitS", settings.lagS());
        e.put("behindS", holdMaxLateNanos / 1e9);
        e.put("catchUpRate", rounded(catchUpRate));
        journal.accept(e);
    }

    /**
     * Owner thread, before start: a command slows the clock when more than {@code share} of its validity
     * was gone when it arrived (default {@value #COMMAND_AGE_SHARE}).
     *
     * @param share [0, 1], 0 = never
     */
    public PlantPacing watchCommandsBeyond(double share) {
        commandPath.share(share);
        return this;
    }

    /**
     * Loop thread, for each command as it came off the bus, before any command fault stage (a delay the
     * scenario injects on purpose is not the machine's).
     *
     * @param c             the command
     * @param receivedNanos the scenario clock's monotonic reading when it arrived, ns
     */
    public void onCommandArrived(UnitCommand c, long receivedNanos) {
        long arrivedMs = clock.epochMillis() - (clock.monotonicNanos() - receivedNanos) / 1_000_000L;
        long w = wall.monotonicNanos();
        CommandPathWatch.OldCommand old = commandPath.observe(c, arrivedMs, w);
        CommandPathWatch.Unanswered unanswered = commandPath.takeUnanswered();
        if (unanswered != null) {
            restore(unanswered, w);
            return;
        }
        if (old == null || holding || !clock.running() || commandPath.awaitingAnswer()) {
            return;
        }
        double from = clock.currentRate();
        if (w - lastChangeWallNanos < Math.round(COMMAND_PATH_SETTLE_WALL_S * 1e9) || from <= COMMAND_PATH_FLOOR_RATE) {
            return;
        }
        double to = Math.max(COMMAND_PATH_FLOOR_RATE, rounded(old.rateFrom(from, MAX_COMMAND_PATH_CUT)));
        clock.runAt(to);
        slowedAt(w, to);
        commandPathSlowdowns++;
        commandPath.cutMade(old, from, to, w);
        Map<String, Object> e = entry("paceSlowed", from, to);
        e.put("reason", "commandPath");
        e.put("unit", c.unit());
        e.put("commandSeq", c.seq());
        e.put("commandAgeS", old.ageMs() / 1000.0);
        e.put("validityS", old.validityMs() / 1000.0);
        e.put("limitS", old.limitMs() / 1000.0);
        journal.accept(e);
    }

    /**
     * The commands stayed as old after a cut: their age is in their stamps, not on the way, and slowing on helps
     * nothing. Back to the rate before that cut, and the watch is off for the rest of the run (journaled).
     */
    private void restore(CommandPathWatch.Unanswered u, long w) {
        double from = clock.currentRate();
        double to = Math.max(from, u.fromRate());
        clock.runAt(to);
        lastChangeWallNanos = w;
        Map<String, Object> e = entry("paceWatchStopped", from, to);
        e.put("reason", "ageNotFromPath");
        e.put("cutAgeS", u.cutAgeMs() / 1000.0);
        e.put("cutFromRate", u.fromRate());
        e.put("cutToRate", u.toRate());
        e.put("youngestAgeAfterS", u.youngestAfterMs() / 1000.0);
        e.put("commandsAfter", u.commandsAfter());
        journal.accept(e);
    }

    /** @return {@code rate} to 0.01 (a rate the clock topic and the progress line show plainly) */
    private static double rounded(double rate) {
        return Math.round(rate * 100) / 100.0;
    }

    private Map<String, Object> entry(String event, double fromRate, double toRate) {
        Map<String, Object> e = new LinkedHashMap<>();
        e.put("event", event);
        e.put("atS", clock.monotonicNanos() / 1e9);
        e.put("fromRate", fromRate);
        e.put("toRate", toRate);
        return e;
    }

    /**
     * Owner thread, when the scenario ended (or the run stopped): journals {@code paceSummary}.
     *
     * @param simulatedS scenario seconds simulated since go
     * @return the line to print when the rate was not kept (asked / kept &gt; the factor)
     */
    public Optional<String> finish(double simulatedS) {
        double wallS = goWallNanos < 0 ? Double.NaN : (wall.monotonicNanos() - goWallNanos) / 1e9;
        double kept = wallS > 0 ? simulatedS / wallS : Double.NaN;
        Map<String, Object> e = new LinkedHashMap<>();
        e.put("event", "paceSummary");
        e.put("askedRate", clock.rate());
        e.put("keptRate", Double.isNaN(kept) ? null : kept);
        e.put("wallS", Double.isNaN(wallS) ? null : wallS);
        e.put("slowdowns", slowdowns);
        e.put("commandPathSlowdowns", commandPathSlowdowns);
        e.put("maxCommandAgeS", commandPath.maxAgeS()); // null: none watched
        e.put("commandPathWatchStopped", commandPath.stopped());
        e.put("holds", holds);
        e.put("raises", raises);
        e.put("heldWallMs", heldWallNanos / 1e6);
        e.put("slips", slips);
        e.put("slipWallMs", slipWallNanos / 1e6);
        e.put("notRunS", Math.round(notRunS * 1000) / 1000.0);
        e.put("lowestRate", lowestRate);
        e.put("maxBehindS", maxLateNanos / 1e9);
        e.put("lagLimitS", settings.lagS());
        boolean notKept = kept > 0 && clock.rate() / kept > settings.notKeptFactor();
        e.put("rateKept", !notKept);
        journal.accept(e);
        if (!notKept) {
            return Optional.empty();
        }
        return Optional.of(String.format(Locale.ROOT, "RATE NOT KEPT: asked %sx, kept %.1fx over %.1f s wall"
                        + " (clock held %d times and slowed %d times (%d for old commands), held %.0f ms in all, slipped %d times on stalls of the"
                        + " loop (%.0f ms in all, %.1f s of scenario not run), lowest rate %.1fx, physics at most"
                        + " %.2f s behind; limit %.2f s); %s",
                trim(clock.rate()), kept, wallS, keeperHolds(), slowdowns, commandPathSlowdowns, heldWallNanos / 1e6, slips,
                slipWallNanos / 1e6, notRunS, lowestRate, maxLateNanos / 1e9, settings.lagS(), commandPath.stopped()
                        ? "the command-path watch stopped (ageNotFromPath): the commands' age is in their own stamps, a"
                        + " lower --rate would not make them younger"
                        : "rehearse at a lower --rate for this machine"));
    }

    /** @return a one-line account of the pacing so far, for the plant's last lines */
    public String describe(double simulatedS) {
        double wallS = goWallNanos < 0 ? Double.NaN : (wall.monotonicNanos() - goWallNanos) / 1e9;
        return String.format(Locale.ROOT, "pace: asked %sx, kept %.1fx, clock held %d times (%.0f ms in all), slowed %d"
                        + " times, raised %d times, slipped %d times (stalls %.0f ms in all, %.1f s of scenario not run),"
                        + " physics at most %.3f s behind (limit %.2f s)",
                trim(clock.rate()), simulatedS / wallS, keeperHolds(), heldWallNanos / 1e6, slowdowns, raises, slips,
                slipWallNanos / 1e6, notRunS, maxLateNanos / 1e9, settings.lagS());
    }

    /** @return holds this keeper made on the physics' lag (kept or slowed after), the leash's slips apart */
    private long keeperHolds() {
        return holds + slowdowns - commandPathSlowdowns - slipSlowdowns;
    }

    private static String trim(double v) {
        return v == Math.rint(v) ? String.valueOf((long) v) : String.valueOf(v);
    }
}
