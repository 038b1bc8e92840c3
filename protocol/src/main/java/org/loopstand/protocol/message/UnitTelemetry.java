package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * One scan of a unit's state as its plant interface reports it.
 *
 * @param seq                per-publisher sequence number, ≥ 0
 * @param sourceTime         epoch ms of the state the reading was taken from (the physics' time, older than
 *                           the clock's while the physics lags), &gt; 0
 * @param unit               unit id
 * @param outputMw           measured electrical output, MW
 * @param outputQuality      quality of the output
 * @param setpointMw         current load reference, MW
 * @param status             online, offline or tripped
 * @param controlMode        remote, local or off
 * @param regulatingMinMw    lower regulating limit, MW, ≤ regulatingMaxMw
 * @param regulatingMaxMw    upper regulating limit, MW
 * @param rampMwPerMin       rate the output can follow, MW/min, ≥ 0
 * @param pulseRateMwPerMin  the load reference moves by pulseRateMwPerMin × duration while a pulse
 *                           acts, MW/min, ≥ 0
 * @param acceptsSetpoints   whether setpoint commands are taken (else pulses only)
 * @param lastCommandSeq     seq of the last command the unit accepted, ≥ 0 (0 before any)
 */
public record UnitTelemetry(long seq, long sourceTime, String unit, double outputMw, Quality outputQuality,
        double setpointMw, UnitStatus status, ControlMode controlMode, double regulatingMinMw,
        double regulatingMaxMw, double rampMwPerMin, double pulseRateMwPerMin, boolean acceptsSetpoints,
        long lastCommandSeq) {
    public UnitTelemetry {
        Objects.requireNonNull(unit, "unit");
    }
}
