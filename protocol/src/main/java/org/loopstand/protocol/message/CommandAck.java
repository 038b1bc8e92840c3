package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * A unit's answer to one command.
 *
 * @param seq          per-unit sequence number, ≥ 0
 * @param sourceTime   epoch ms at the unit, &gt; 0
 * @param unit         unit id
 * @param commandSeq   seq of the command answered, ≥ 0
 * @param controllerId controller the command came from
 * @param outcome      accepted or rejected
 * @param reason       why it was rejected; absent when accepted
 * @param detail       free text for people, optional, at most 1024 characters
 */
public record CommandAck(long seq, long sourceTime, String unit, long commandSeq, String controllerId,
        AckOutcome outcome, @OptionalField RefusalReason reason, @OptionalField String detail) {
    public CommandAck {
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(controllerId, "controllerId");
    }
}
