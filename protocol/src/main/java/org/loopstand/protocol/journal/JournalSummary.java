package org.loopstand.protocol.journal;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.List;
import java.util.Optional;

/**
 * What reading a journal found, besides the entries themselves.
 *
 * @param header             the header line, empty when the file has no complete header line
 * @param entriesAccepted    entries handed to the consumer (header and end excluded)
 * @param end                the closing {@code end} entry, empty when there is none
 * @param tornTail           true when the last line is incomplete (no newline) or not parseable
 * @param tornTailOffsetBytes byte offset where the torn last line starts, −1 when not torn
 * @param damagedLines       lines before the last that could not be read (skipped, never silently)
 * @param lastEntryTimeMs    scenario time of the last accepted entry (or header start), epoch ms; −1 if none
 */
public record JournalSummary(Optional<ObjectNode> header, long entriesAccepted, Optional<JournalEntry> end,
        boolean tornTail, long tornTailOffsetBytes, List<JournalDamage> damagedLines, long lastEntryTimeMs) {

    /** @return true when the journal has no end entry: the writing process did not close it cleanly */
    public boolean cutShort() {
        return end.isEmpty();
    }

    /** @return the end reason, empty when cut short */
    public Optional<EndReason> endReason() {
        return end.map(e -> EndReason.fromWireName(e.text(JournalFormat.FIELD_REASON)));
    }

    /** @return the writing process's name from the header, or "unknown" */
    public String process() {
        return header.map(h -> h.path("process").asText("unknown")).orElse("unknown");
    }

    /** @return a one-line account for logs and reports */
    public String describe() {
        StringBuilder sb = new StringBuilder();
        sb.append(process()).append(": ").append(entriesAccepted).append(" entries");
        if (cutShort()) {
            sb.append(", CUT SHORT (no end entry)");
        } else {
            sb.append(", ended ").append(endReason().map(EndReason::wireName).orElse("?"));
        }
        if (tornTail) {
            sb.append(", torn last line at byte ").append(tornTailOffsetBytes).append(" ignored");
        }
        if (!damagedLines.isEmpty()) {
            sb.append(", ").append(damagedLines.size()).append(" damaged line(s) skipped");
        }
        return sb.toString();
    }
}
