package org.loopstand.controller.pulse;

import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.CommandKind;

/**
 * A command the cycle wants sent; the integration step turns it into a wire command.
 *
 * @param unitId       unit id
 * @param kind         pulse or setpoint
 * @param direction    raise or lower; null for a setpoint
 * @param durationMs   pulse duration, ms (0 for a setpoint)
 * @param setpointMw   new setpoint, MW; NaN for a pulse
 * @param deltaMw      the move this command asks for, MW (+ = raise); for a pulse
 *                     {@code ±durationMs·pulseRate/60000}
 * @param issuedAtMs   controller time of issue, epoch ms
 * @param validUntilMs expiry, epoch ms (issuedAt + one cycle); never executed after it
 */
public record PlannedCommand(String unitId, CommandKind kind, PulseDirection direction, long durationMs,
                             double setpointMw, double deltaMw, long issuedAtMs, long validUntilMs) {
    public PlannedCommand {
        if (validUntilMs <= issuedAtMs) {
            throw new IllegalArgumentException("validUntilMs must be after issuedAtMs");
        }
        if (kind == CommandKind.PULSE && (direction == null || durationMs <= 0)) {
            throw new IllegalArgumentException("a pulse needs a direction and durationMs > 0");
        }
        if (kind == CommandKind.SETPOINT && (direction != null || durationMs != 0 || !Double.isFinite(setpointMw))) {
            throw new IllegalArgumentException("a setpoint needs a finite setpointMw, no direction and durationMs 0");
        }
    }
}
