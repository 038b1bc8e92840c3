package org.loopstand.protocol.journal;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.Objects;
import java.util.OptionalDouble;

/**
 * One journal line as read back.
 *
 * @param tMs        scenario time of the entry, epoch ms
 * @param kind       the entry's kind
 * @param fields     the whole line as a JSON object (includes {@code t} and {@code kind})
 * @param lineNumber 1-based line number in the file (the header is line 1)
 */
public record JournalEntry(long tMs, String kind, ObjectNode fields, long lineNumber) {
    public JournalEntry {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(fields, "fields");
    }

    /** @return the named field, or null when absent */
    public JsonNode get(String name) {
        return fields.get(name);
    }

    /** @return the named field as text, or null when absent or JSON null */
    public String text(String name) {
        JsonNode n = fields.get(name);
        return n == null || n.isNull() ? null : n.asText();
    }

    /** @return the named field as a number, empty when absent or not numeric */
    public OptionalDouble number(String name) {
        JsonNode n = fields.get(name);
        return n != null && n.isNumber() ? OptionalDouble.of(n.doubleValue()) : OptionalDouble.empty();
    }

    /** @return true for the closing {@code end} entry */
    public boolean isEnd() {
        return JournalFormat.KIND_END.equals(kind);
    }
}
