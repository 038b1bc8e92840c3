package org.loopstand.controller.pulse;

/**
 * @param command      the command to send, or null when nothing is sent
 * @param wantedMw     the move that was asked for, MW
 * @param skipReason   why nothing is sent (null when a command is sent): {@code belowMinimum},
 *                     {@code noChange}, {@code noPulseRate}
 * @param clipped      the pulse was cut to the maximum duration
 */
public record PulseOutcome(PlannedCommand command, double wantedMw, String skipReason, boolean clipped) {
    public boolean sends() {
        return command != null;
    }
}
