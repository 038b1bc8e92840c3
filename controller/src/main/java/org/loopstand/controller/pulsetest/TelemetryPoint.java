package org.loopstand.controller.pulsetest;

/**
 * One unit telemetry scan as received.
 *
 * @param tMs        when it arrived, epoch ms on the test's clock
 * @param outputMw   measured output, MW
 * @param setpointMw the unit's load reference, MW
 * @param good       output quality was good (only good readings are measured)
 * @param governorMw the unit's expected governor answer to the measured frequency at that time, MW; NaN
 *                   when unknown (no droop in the site file or no frequency reading yet)
 */
public record TelemetryPoint(long tMs, double outputMw, double setpointMw, boolean good, double governorMw) {
    /** @return the unit's own response: output less its governor's answer to frequency, MW */
    public double ownMw() {
        return Double.isNaN(governorMw) ? outputMw : outputMw - governorMw;
    }
}
