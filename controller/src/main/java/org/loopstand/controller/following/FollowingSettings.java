package org.loopstand.controller.following;

/**
 * @param deadTimeMs          time a unit may take before its output starts to move, ms, ≥ 0 (default 8000)
 * @param toleranceMw         shortfall against the expected move still counted as following, MW,
 *                            &gt; 0 (default 2); covers governor action and measurement noise
 * @param missedCyclesToFlag  consecutive checks failed before a unit is flagged, ≥ 1 (default 5)
 * @param followedCyclesToReturn consecutive checks passed before a flagged unit returns, ≥ 1 (default 3)
 */
public record FollowingSettings(long deadTimeMs, double toleranceMw, int missedCyclesToFlag, int followedCyclesToReturn) {
    public static final FollowingSettings DEFAULTS = new FollowingSettings(8000, 2.0, 5, 3);

    public FollowingSettings {
        if (deadTimeMs < 0) {
            throw new IllegalArgumentException("deadTimeMs must be >= 0, was " + deadTimeMs);
        }
        if (!(toleranceMw > 0)) {
            throw new IllegalArgumentException("toleranceMw must be > 0, was " + toleranceMw);
        }
        if (missedCyclesToFlag < 1 || followedCyclesToReturn < 1) {
            throw new IllegalArgumentException("missedCyclesToFlag and followedCyclesToReturn must be >= 1");
        }
    }
}
