package org.loopstand.controller.following;

/**
 * @param deadTimeMs          time a unit may take before its output starts to move, ms, ≥ 0 (default 8000)
 * @param toleranceMw         shortfall against the expected move still counted as following, MW,
 *                            &gt; 0 (default 2); covers governor action and measurement noise
 * @param missedCyclesToFlag  consecutive failed checks, each on a new telemetry reading, before a
 *                            unit is flagged, ≥ 1 (default 5)
 * @param followedCyclesToReturn consecutive checks passed before a flagged unit returns, ≥ 1 (default 3)
 * @param governorSettleMs    how long a turbine's primary response may take to settle after the
 *                            frequency moves, ms, ≥ 0 (default 120000: a hydro unit with transient
 *                            droop takes a minute or more; common practice, no source). The check
 *                            allows the spread of the governor share over this window
 * @param probeIntervalMs     scenario time from a flag (or a failed probe) to the next re-admission
 *                            probe, ms, ≥ 1000 (default 60000)
 * @param probeMw             size of a re-admission probe move, MW, &gt; 0 (default 5); the probe is
 *                            passed once the unit has made it within {@code toleranceMw}
 */
public record FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn,
                                long governorSettleMs, long probeIntervalMs, double probeMw) {
    public static final long DEFAULT_GOVERNOR_SETTLE_MS = 120_000;
    public static final long DEFAULT_PROBE_INTERVAL_MS = 60_000;
    public static final double DEFAULT_PROBE_MW = 5.0;
    public static final FollowingSettings DEFAULTS = new FollowingSettings(8000, 2.0, 5, 3);

    /** With the default governor settling window and probe. */
    public FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn) {
        this(deadTimeMs, toleranceMw, missedCyclesToFlag, followedCyclesToReturn, DEFAULT_GOVERNOR_SETTLE_MS);
    }

    /** With the default probe. */
    public FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn,
                             long governorSettleMs) {
        this(deadTimeMs, toleranceMw, missedCyclesToFlag, followedCyclesToReturn, governorSettleMs,
                DEFAULT_PROBE_INTERVAL_MS, DEFAULT_PROBE_MW);
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
        if (probeIntervalMs < 1000) {
            throw new IllegalArgumentException("probeIntervalMs must be >= 1000, was " + probeIntervalMs);
        }
        if (!(probeMw > 0) || !Double.isFinite(probeMw)) {
            throw new IllegalArgumentException("probeMw must be > 0, was " + probeMw);
        }
    }
}
