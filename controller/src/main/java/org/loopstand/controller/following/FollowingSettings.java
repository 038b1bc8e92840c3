package org.loopstand.controller.following;

/**
 * @param deadTimeMs          time a unit may take before its output starts to move, ms, ≥ 0 (default 8000)
 * @param toleranceMw         shortfall against the expected move still counted as following, MW,
 *                            &gt; 0 (default 2); covers governor action and measurement noise
 * @param missedCyclesToFlag  consecutive checks failed before a unit is flagged, ≥ 1 (default 5)
 * @param followedCyclesToReturn consecutive checks passed before a flagged unit returns, ≥ 1 (default 3)
 * @param governorSettleMs    how long a turbine's primary response may take to settle after the
 *                            frequency moves, ms, ≥ 0 (default 120000: a hydro unit with transient
 *                            droop takes a minute or more; common practice, no source). The check
 *                            allows the spread of the governor share over this window
 */
public record FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn,
                                long governorSettleMs) {
    public static final long DEFAULT_GOVERNOR_SETTLE_MS = 120_000;
    public static final FollowingSettings DEFAULTS = new FollowingSettings(8000, 2.0, 5, 3);

    /** With the default governor settling window. */
    public FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn) {
        this(deadTimeMs, toleranceMw, missedCyclesToFlag, followedCyclesToReturn, DEFAULT_GOVERNOR_SETTLE_MS);
    }

    public FollowingSettings {
        if (deadTimeMs < 0) {
            throw new IllegalArgumentException("deadTimeMs must be >= 0, was " + deadTimeMs);
        }
        if (!(toleranceMw > 0)) {
            throw new IllegalArgumentException("toleranceMw must be > 0, was " + toleranceMw);
        }
        if (governorSettleMs < 0) {
            throw new IllegalArgumentException("governorSettleMs must be >= 0, was " + governorSettleMs);
        }
        if (missedCyclesToFlag < 1 || followedCyclesToReturn < 1) {
            throw new IllegalArgumentException("missedCyclesToFlag and followedCyclesToReturn must be >= 1");
        }
    }
}
