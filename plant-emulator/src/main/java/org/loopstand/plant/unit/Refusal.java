package org.loopstand.plant.unit;

import org.loopstand.protocol.message.RefusalReason;

/** Why a command is not applied, with a sentence for people. */
public record Refusal(RefusalReason reason, String detail) {
}
