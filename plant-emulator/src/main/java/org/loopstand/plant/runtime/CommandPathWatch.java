package org.loopstand.plant.runtime;

import org.loopstand.protocol.message.UnitCommand;

/**
 * The pace keeper's view of the command path: how old commands are when they come off the bus
 * (scenario time from {@code issuedAt} to arrival), against a share of their validity. It only measures
 * and says which command is too old; {@link PlantPacing} decides what the clock does.
 *
 * <p>A slow-down is a test of where the age comes from: wall time on the way shrinks in scenario time with
 * the rate, an age written into the commands' own stamps (a controller whose clock runs behind, or that
 * back-dates its commands) does not. After each cut the next commands must come younger than
 * {@value #UNCHANGED_AGE_SHARE} of the age that made it; when {@value #UNCHANGED_COMMANDS} or more, over
 * at least the settle time of wall time, do not, the age is not the path's: the watch stops for the rest
 * of the run ({@link #takeUnanswered}) and the controller is judged on its commands as they are.
 */
final class CommandPathWatch {
    /** Share of the age that made a cut which the commands after it keep when the age is not the path's. */
    static final double UNCHANGED_AGE_SHARE = 0.9;
    /** Commands, after the settle time, that must all keep that share before the watch stops. */
    static final int UNCHANGED_COMMANDS = 3;

    /**
     * A cut the commands did not answer.
     *
     * @param cutAgeMs          age of the command that made the cut, scenario ms
     * @param youngestAfterMs   youngest command after the settle time, scenario ms
     * @param commandsAfter     commands seen after the settle time, all at least the share as old
     * @param fromRate          rate before the cut
     * @param toRate            rate the cut set
     */
    record Unanswered(long cutAgeMs, long youngestAfterMs, int commandsAfter, double fromRate, double toRate) {
    }

    private record Cut(long ageMs, double fromRate, double toRate, long wallNanos) {
    }

    /** An arrived command older than the share of its validity, with the figures a slow-down is journaled with. */
    record OldCommand(long ageMs, long validityMs, double limitMs) {
        /**
         * @param fromRate the rate the clock runs at, scenario s per wall s
         * @param maxCut   deepest cut, share of {@code fromRate} in (0, 1)
         * @return the rate at which the same wall time on the way would leave a command {@code limitMs / 2} old:
         *         {@code fromRate × (limitMs / 2) / ageMs} (below half of {@code fromRate}, as the age is over the
         *         limit), no lower than {@code maxCut × fromRate}
         */
        double rateFrom(double fromRate, double maxCut) {
            return Math.max(fromRate * maxCut, fromRate * (limitMs / 2) / ageMs);
        }
    }

    private double share;
    private final long settleNanos;
    private long maxAgeMs;
    private long seen;
    /** the last cut while its answer is awaited, else null */
    private Cut pending;
    private int unchangedCount;
    private long youngestUnchangedMs;
    private long firstUnchangedWallNanos;
    private Unanswered unanswered;
    private boolean stopped;
    /** wall ns of the last command older than half the limit: the rate is not raised until calm after it */
    private long lastStrainedWallNanos = Long.MIN_VALUE / 2;

    /**
     * @param share       share of a command's validity gone on the way beyond which it is too old, [0, 1], 0 = never
     * @param settleNanos wall ns after a cut before the commands answer it (those on the way were issued before), &gt; 0
     */
    CommandPathWatch(double share, long settleNanos) {
        share(share);
        this.settleNanos = settleNanos;
    }

    /** @param share [0, 1], 0 = never */
    void share(double share) {
        if (!(share >= 0 && share <= 1)) {
            throw new IllegalArgumentException("command age share must be 0 (off) or in (0, 1], got " + share);
        }
        this.share = share;
    }

    /**
     * @param c         the command as it came off the bus
     * @param arrivedMs scenario time it arrived at, epoch ms
     * @param wallNanos wall clock's monotonic reading now, ns
     * @return the command's figures when it is older than the share, else null (also when the watch is off
     *         or the command has no validity)
     */
    OldCommand observe(UnitCommand c, long arrivedMs, long wallNanos) {
        long ageMs = arrivedMs - c.issuedAt();
        long validityMs = c.validUntil() - c.issuedAt();
        maxAgeMs = seen++ == 0 ? ageMs : Math.max(maxAgeMs, ageMs);
        double limitMs = share * validityMs;
        if (share <= 0 || validityMs <= 0 || stopped) {
            return null;
        }
        if (pending != null && wallNanos - pending.wallNanos() >= settleNanos) {
            answer(ageMs, wallNanos);
            if (stopped) {
                return null;
            }
        }
        if (ageMs > limitMs / 2) {
            lastStrainedWallNanos = wallNanos;
        }
        return ageMs > limitMs ? new OldCommand(ageMs, validityMs, limitMs) : null;
    }

    private void answer(long ageMs, long wallNanos) {
        if (ageMs < UNCHANGED_AGE_SHARE * pending.ageMs()) {
            pending = null; // the age followed the rate: the path's
            return;
        }
        if (unchangedCount++ == 0) {
            firstUnchangedWallNanos = wallNanos;
            youngestUnchangedMs = ageMs;
        }
        youngestUnchangedMs = Math.min(youngestUnchangedMs, ageMs);
        // several commands over a span of wall time: one hold-up's burst of old commands is not enough
        if (unchangedCount >= UNCHANGED_COMMANDS && wallNanos - firstUnchangedWallNanos >= settleNanos) {
            unanswered = new Unanswered(pending.ageMs(), youngestUnchangedMs, unchangedCount, pending.fromRate(),
                    pending.toRate());
            stopped = true;
            pending = null;
        }
    }

    /** The pace keeper cut the rate for {@code old}: the commands after the settle time answer it. */
    void cutMade(OldCommand old, double fromRate, double toRate, long wallNanos) {
        pending = new Cut(old.ageMs(), fromRate, toRate, wallNanos);
        unchangedCount = 0;
    }

    /** @return true while the last cut's answer is awaited (no further cut meanwhile) */
    boolean awaitingAnswer() {
        return pending != null;
    }

    /** @return the cut the commands did not answer, once, when the watch stopped on it; else null */
    Unanswered takeUnanswered() {
        Unanswered u = unanswered;
        unanswered = null;
        return u;
    }

    /** @return true when the watch stopped because the commands' age did not follow the rate */
    boolean stopped() {
        return stopped;
    }

    /** @return true when no command older than half the limit arrived in the last {@code calmNanos} of wall time */
    boolean calmFor(long wallNanos, long calmNanos) {
        return wallNanos - lastStrainedWallNanos >= calmNanos;
    }

    /** @return the oldest command seen, scenario s, or null when none was watched */
    Double maxAgeS() {
        return seen == 0 ? null : maxAgeMs / 1000.0;
    }
}
