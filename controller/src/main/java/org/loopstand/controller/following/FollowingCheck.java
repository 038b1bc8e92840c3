package org.loopstand.controller.following;

/**
 * Result of one unit-following check.
 *
 * @param unitId        unit id
 * @param evaluated     false when nothing was outstanding (the unit is idle; baseline resynced)
 * @param expectedMw    expected output at (now − dead time), MW
 * @param measuredMw    measured output, MW
 * @param shortfallMw   how far the unit lags in the commanded direction, MW (≤ 0 = on or ahead)
 * @param following     shortfall within tolerance
 * @param missedCycles  consecutive failed checks
 * @param flagged       the unit is flagged as not following (out of the allocation)
 * @param flaggedNow    flagged on this check
 * @param returnedNow   returned to the allocation on this check
 * @param allowanceMw   governor allowance added to the tolerance on this check, MW (≥ 0)
 * @param probing       this check judged a re-admission probe of the flagged unit
 * @param probeFailedNow the probe under way was not followed ({@code missedCyclesToFlag} misses)
 */
public record FollowingCheck(String unitId, boolean evaluated, double expectedMw, double measuredMw, double shortfallMw,
                             boolean following, int missedCycles, boolean flagged, boolean flaggedNow,
                             boolean returnedNow, double allowanceMw, boolean probing, boolean probeFailedNow) {
    /** A check outside any probe. */
    public FollowingCheck(String unitId, boolean evaluated, double expectedMw, double measuredMw, double shortfallMw,
                          boolean following, int missedCycles, boolean flagged, boolean flaggedNow,
                          boolean returnedNow, double allowanceMw) {
        this(unitId, evaluated, expectedMw, measuredMw, shortfallMw, following, missedCycles, flagged, flaggedNow,
                returnedNow, allowanceMw, false, false);
    }
}
