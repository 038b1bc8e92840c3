package org.loopstand.controller.pulsetest;

/**
 * One unit telemetry scan as received.
 *
 * @param tMs        when it arrived, epoch ms on the test's clock
 * @param outputMw   measured output, MW
 * @param setpointMw the unit's load reference, MW
 * @param good       output quality was good (only good readings are measured)
 */
public record TelemetryPoint(long tMs, double outputMw, double setpointMw, boolean good) {
}
