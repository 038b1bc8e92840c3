package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * A unit the controller has taken out of its allocation, as listed in its status.
 *
 * @param unit        unit id
 * @param area        area id the unit regulates for
 * @param reason      reason code (1 to 256 characters), e.g. {@code notFollowing},
 *                    {@code commandsNotExecuted:expired}
 * @param shortfallMw how far the unit fell short of the move asked of it at the exclusion, MW,
 *                    in [-1000000, 1000000]
 */
public record ExcludedUnit(String unit, String area, String reason, double shortfallMw) {
    public ExcludedUnit {
        Objects.requireNonNull(unit, "unit");
    }
}
