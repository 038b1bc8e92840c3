package org.loopstand.controller.pulsetest.analysis;

import org.loopstand.protocol.message.RefusalReason;

/**
 * A command the unit refused.
 *
 * @param commandSeq the command's seq
 * @param reason     the unit's reason
 * @param detail     the unit's free text, may be empty
 */
public record Refusal(long commandSeq, RefusalReason reason, String detail) {
}
