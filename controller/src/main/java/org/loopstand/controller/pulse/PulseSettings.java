package org.loopstand.controller.pulse;

/**
 * @param minPulseMs           shortest pulse sent, ms, ≥ 1 (default 200); a shorter one is dropped
 * @param maxPulseMs           longest pulse sent, ms, ≥ minPulseMs and ≤ 600000 (default 4000,
 *                             one default cycle); a longer one is cut to this
 * @param preferSetpoints      send setpoints to units that accept them (default true)
 * @param minSetpointChangeMw  smallest setpoint change sent, MW, ≥ 0 (default 0.5)
 */
public record PulseSettings(long minPulseMs, long maxPulseMs, boolean preferSetpoints, double minSetpointChangeMw) {
    public static final PulseSettings DEFAULTS = new PulseSettings(200, 4000, true, 0.5);

    public PulseSettings {
        if (minPulseMs < 1) {
            throw new IllegalArgumentException("minPulseMs must be >= 1, was " + minPulseMs);
        }
        if (maxPulseMs < minPulseMs || maxPulseMs > 600_000) {
            throw new IllegalArgumentException("maxPulseMs must be in [minPulseMs=" + minPulseMs + ", 600000], was " + maxPulseMs);
        }
        if (!(minSetpointChangeMw >= 0)) {
            throw new IllegalArgumentException("minSetpointChangeMw must be >= 0, was " + minSetpointChangeMw);
        }
    }
}
