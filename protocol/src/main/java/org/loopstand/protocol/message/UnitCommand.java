package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * A raise/lower pulse or a setpoint for one unit.
 *
 * @param seq          per-controller sequence number, ≥ 0, increasing
 * @param sourceTime   epoch ms at the controller, &gt; 0
 * @param unit         target unit id
 * @param controllerId sending controller id
 * @param epoch        controller epoch, epoch ms (its start time; raised on each takeover), ≥ 0
 * @param issuedAt     epoch ms the command was issued, &gt; 0
 * @param validUntil   epoch ms after which the unit must not act on it, &gt; issuedAt; the MQTT
 *                     message expiry is set from it in wall seconds (docs/controller-contract.md § 6)
 * @param kind         pulse or setpoint
 * @param direction    raise or lower for a pulse; absent for a setpoint
 * @param durationMs   pulse length, ms, in [1, 600000]; 0 for a setpoint
 * @param setpointMw   target load reference, MW, for a setpoint only
 * @param keyId        id of the signing key, optional
 * @param signature    base64 HMAC over the canonical bytes, optional
 */
public record UnitCommand(long seq, long sourceTime, String unit, String controllerId, long epoch, long issuedAt,
        long validUntil, CommandKind kind, @OptionalField PulseDirection direction, long durationMs,
        @OptionalField Double setpointMw, @OptionalField String keyId, @OptionalField String signature) {
    public UnitCommand {
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(controllerId, "controllerId");
        Objects.requireNonNull(kind, "kind");
    }

    /** @return a pulse command, unsigned */
    public static UnitCommand pulse(long seq, long sourceTime, String unit, String controllerId, long epoch,
            long validUntil, PulseDirection direction, long durationMs) {
        return new UnitCommand(seq, sourceTime, unit, controllerId, epoch, sourceTime, validUntil,
                CommandKind.PULSE, direction, durationMs, null, null, null);
    }

    /** @return a setpoint command, unsigned */
    public static UnitCommand setpoint(long seq, long sourceTime, String unit, String controllerId, long epoch,
            long validUntil, double setpointMw) {
        return new UnitCommand(seq, sourceTime, unit, controllerId, epoch, sourceTime, validUntil,
                CommandKind.SETPOINT, null, 0, setpointMw, null, null);
    }

    /** @return this command with key id and signature set (both may be null to clear them) */
    public UnitCommand withSignature(String newKeyId, String newSignature) {
        return new UnitCommand(seq, sourceTime, unit, controllerId, epoch, issuedAt, validUntil, kind, direction,
                durationMs, setpointMw, newKeyId, newSignature);
    }
}
