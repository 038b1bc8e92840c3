package org.loopstand.controller.pulse;

import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.CommandKind;

import org.loopstand.controller.allocation.UnitState;

/**
 * Turns a wanted move of a unit into a pulse or a setpoint.
 * <pre>
 *   durationMs = round(|ΔMW| / pulseRateMwPerMin × 60000), then
 *     &lt; minPulseMs → nothing sent; &gt; maxPulseMs → maxPulseMs
 *   validUntil = issuedAt + cycleMs
 * </pre>
 * Remainder policy: a move too small to send is dropped, not accumulated. The allocation is
 * positional (target − the unit's reported setpoint), so the part not sent reappears by itself in
 * the next cycle's move; accumulating it as well would count it twice. Likewise the part cut by
 * the maximum duration. Stateless.
 */
public final class PulsePlanner {
    private final PulseSettings settings;

    public PulsePlanner(PulseSettings settings) {
        this.settings = settings;
    }

    /**
     * @param unit       the unit (setpoint, pulse rate, whether it takes setpoints)
     * @param targetMw   where the unit should go this cycle, MW
     * @param issuedAtMs controller time, epoch ms
     * @param cycleMs    control cycle, ms, &gt; 0 (sets validUntil)
     */
    public PulseOutcome plan(UnitState unit, double targetMw, long issuedAtMs, long cycleMs) {
        if (cycleMs <= 0) {
            throw new IllegalArgumentException("cycleMs must be > 0, was " + cycleMs);
        }
        double wanted = targetMw - unit.setpointMw();
        long validUntil = issuedAtMs + cycleMs;
        if (settings.preferSetpoints() && unit.acceptsSetpoints()) {
            if (Math.abs(wanted) < settings.minSetpointChangeMw() || wanted == 0) {
                return new PulseOutcome(null, wanted, wanted == 0 ? "noChange" : "belowMinimum", false);
            }
            return new PulseOutcome(new PlannedCommand(unit.unitId(), CommandKind.SETPOINT, null, 0, targetMw, wanted,
                    issuedAtMs, validUntil), wanted, null, false);
        }
        if (wanted == 0) {
            return new PulseOutcome(null, wanted, "noChange", false);
        }
        if (!(unit.pulseRateMwPerMin() > 0)) {
            return new PulseOutcome(null, wanted, "noPulseRate", false);
        }
        long durationMs = Math.round(Math.abs(wanted) / unit.pulseRateMwPerMin() * 60_000.0);
        if (durationMs < settings.minPulseMs()) {
            return new PulseOutcome(null, wanted, "belowMinimum", false);
        }
        boolean clipped = durationMs > settings.maxPulseMs();
        durationMs = Math.min(durationMs, settings.maxPulseMs());
        double delta = Math.copySign(durationMs * unit.pulseRateMwPerMin() / 60_000.0, wanted);
        PulseDirection dir = wanted > 0 ? PulseDirection.RAISE : PulseDirection.LOWER;
        return new PulseOutcome(new PlannedCommand(unit.unitId(), CommandKind.PULSE, dir, durationMs, Double.NaN, delta,
                issuedAtMs, validUntil), wanted, null, clipped);
    }

    public PulseSettings settings() {
        return settings;
    }
}
