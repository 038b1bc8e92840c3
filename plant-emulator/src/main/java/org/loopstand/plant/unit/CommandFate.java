package org.loopstand.plant.unit;

import org.loopstand.protocol.message.UnitCommand;

/**
 * What a unit plant interface did with one command, for the run journal.
 *
 * @param unit                  unit id
 * @param commandSeq            the command's seq (−1 when a malformed payload had none)
 * @param controllerId          sender, may be null for a malformed payload
 * @param kind                  {@code pulse}, {@code setpoint}, or null when malformed
 * @param direction             {@code raise}/{@code lower} for a pulse, else null
 * @param durationMs            pulse duration, ms; 0 for a setpoint
 * @param setpointMw            setpoint, MW; null for a pulse
 * @param validUntil            the command's expiry, epoch ms; 0 when malformed
 * @param outcome               {@code accepted} or {@code rejected}
 * @param reason                refusal reason (wire name), null when accepted
 * @param detail                sentence for people (ack detail), may be null
 * @param loadReferenceBeforeMw load reference target before the command, MW (NaN before the first field reading)
 * @param loadReferenceAfterMw  load reference target after it, MW (= before when refused)
 * @param issuedAt              the command's issue time at the controller, epoch ms (scenario time); 0 when malformed
 * @param epoch                 the controller epoch the command carried; −1 when malformed
 */
public record CommandFate(String unit, long commandSeq, String controllerId, String kind, String direction,
                          long durationMs, Double setpointMw, long validUntil, String outcome, String reason,
                          String detail, double loadReferenceBeforeMw, double loadReferenceAfterMw, long issuedAt,
                          long epoch) {

    /** @return the fate of command {@code c} (null for a payload that did not decode) */
    static CommandFate of(String unit, UnitCommand c, long commandSeq, String controllerId, String outcome,
                          String reason, String detail, double beforeMw, double afterMw) {
        if (c == null) {
            return new CommandFate(unit, commandSeq, controllerId, null, null, 0, null, 0, outcome, reason,
                    detail, beforeMw, afterMw, 0, -1);
        }
        return new CommandFate(unit, commandSeq, controllerId, c.kind() == null ? null : c.kind().wireName(),
                c.direction() == null ? null : c.direction().wireName(), c.durationMs(), c.setpointMw(), c.validUntil(),
                outcome, reason, detail, beforeMw, afterMw, c.issuedAt(), c.epoch());
    }
}
