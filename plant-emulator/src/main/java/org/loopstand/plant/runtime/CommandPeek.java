package org.loopstand.plant.runtime;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

/**
 * Best-effort read of seq and controllerId from a command that did not decode, so the refusal ack can
 * name them. Never throws.
 */
final class CommandPeek {
    private static final ObjectMapper MAPPER = new ObjectMapper();
    static final String UNKNOWN_CONTROLLER = "unknown";

    record Peeked(long seq, String controllerId) {
    }

    private CommandPeek() {
    }

    static Peeked peek(byte[] payload) {
        try {
            JsonNode n = MAPPER.readTree(payload);
            long seq = n != null && n.path("seq").canConvertToLong() ? Math.max(0, n.path("seq").asLong()) : 0;
            String c = n != null && n.path("controllerId").isTextual() ? n.path("controllerId").asText() : UNKNOWN_CONTROLLER;
            return new Peeked(seq, c.isEmpty() ? UNKNOWN_CONTROLLER : c);
        } catch (Exception e) {
            return new Peeked(0, UNKNOWN_CONTROLLER);
        }
    }
}
