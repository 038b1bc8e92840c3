package org.loopstand.controller.allocation;

/**
 * @param unitId       unit id
 * @param basePointMw  the unit's base point, MW
 * @param shareMw      regulation assigned to the unit (target − base before the ramp limit), MW
 * @param targetMw     where the unit should be at the end of this cycle, MW (ramp applied)
 * @param deltaMw      targetMw − present setpoint, MW
 * @param limitedBy    what bounded the move
 */
public record UnitAllocation(String unitId, double basePointMw, double shareMw, double targetMw, double deltaMw,
                             LimitedBy limitedBy) {
}
