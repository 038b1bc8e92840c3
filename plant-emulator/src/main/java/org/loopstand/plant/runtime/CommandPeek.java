package org.loopstand.plant.runtime;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.loopstand.protocol.message.Ids;

/**
 * Best-effort read of seq and controllerId from a command that did not decode, so the refusal ack can
 * name them; a missing or invalid controllerId becomes {@value #UNKNOWN_CONTROLLER}, so the ack always
 * goes out. Never throws.
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
            // an id the contract refuses cannot go into the ack either: the ack would not encode
            return new Peeked(seq, Ids.isValid(c) ? c : UNKNOWN_CONTROLLER);
        } catch (Exception e) {
            return new Peeked(0, UNKNOWN_CONTROLLER);
        }
    }
}
