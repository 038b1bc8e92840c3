package org.loopstand.plant.runtime;

import org.loopstand.protocol.message.UnitCommand;

/**
 * The pace keeper's view of the command path: how old commands are when they come off the bus
 * (scenario time from {@code issuedAt} to arrival), against a share of their validity. It only measures
 * and says which command is too old; {@link PlantPacing} decides what the clock does.
 */
final class CommandPathWatch {
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
    private long maxAgeMs;
    private long seen;
    /** wall ns of the last command older than half the limit: the rate is not raised until calm after it */
    private long lastStrainedWallNanos = Long.MIN_VALUE / 2;

    /** @param share share of a command's validity gone on the way beyond which it is too old, [0, 1], 0 = never */
    CommandPathWatch(double share) {
        share(share);
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
        if (share <= 0 || validityMs <= 0) {
            return null;
        }
        if (ageMs > limitMs / 2) {
            lastStrainedWallNanos = wallNanos;
        }
        return ageMs > limitMs ? new OldCommand(ageMs, validityMs, limitMs) : null;
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
