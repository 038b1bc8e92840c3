package org.loopstand.controller.allocation;

/**
 * What the controller knows of one unit this cycle, filled from its telemetry.
 *
 * @param unitId             unit id
 * @param areaId             area the unit regulates for
 * @param inRemote           control mode is remote (the unit takes commands)
 * @param online             status online (not offline or tripped)
 * @param telemetryGood      the unit's telemetry passed validation (fresh, good quality)
 * @param setpointMw         the unit's present load reference / setpoint, MW
 * @param outputMw           measured output, MW
 * @param regulatingMinMw    lower regulating limit, MW
 * @param regulatingMaxMw    upper regulating limit, MW (≥ min)
 * @param rampMwPerMin       ramp limit, MW/min, ≥ 0
 * @param pulseRateMwPerMin  load reference speed while a pulse acts, MW/min, ≥ 0
 * @param acceptsSetpoints   the unit takes setpoint commands
 * @param telemetryTimeMs    source time of the telemetry these figures come from, epoch ms
 */
public record UnitState(String unitId, String areaId, boolean inRemote, boolean online, boolean telemetryGood,
                        double setpointMw, double outputMw, double regulatingMinMw, double regulatingMaxMw,
                        double rampMwPerMin, double pulseRateMwPerMin, boolean acceptsSetpoints,
                        long telemetryTimeMs) {
    public UnitState {
        if (unitId == null || areaId == null) {
            throw new IllegalArgumentException("unitId and areaId are required");
        }
        if (!(regulatingMinMw <= regulatingMaxMw)) {
            throw new IllegalArgumentException("unit " + unitId + ": regulatingMinMw (" + regulatingMinMw
                    + ") must be <= regulatingMaxMw (" + regulatingMaxMw + ")");
        }
        if (!(rampMwPerMin >= 0) || !(pulseRateMwPerMin >= 0)) {
            throw new IllegalArgumentException("unit " + unitId + ": ramp and pulse rate must be >= 0");
        }
    }

    /** @return a copy with another setpoint (e.g. the commanded one while telemetry lags) */
    public UnitState withSetpointMw(double mw) {
        return new UnitState(unitId, areaId, inRemote, online, telemetryGood, mw, outputMw, regulatingMinMw,
                regulatingMaxMw, rampMwPerMin, pulseRateMwPerMin, acceptsSetpoints, telemetryTimeMs);
    }

    /** @return the largest move in one cycle, MW */
    public double rampPerCycleMw(double cycleS) {
        return rampMwPerMin * cycleS / 60.0;
    }
}
