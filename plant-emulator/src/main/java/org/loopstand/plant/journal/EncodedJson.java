package org.loopstand.plant.journal;

import java.io.IOException;
import java.io.UncheckedIOException;

import com.fasterxml.jackson.annotation.JsonValue;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

/**
 * An encoded message as a journal field: written as the JSON object it is, parsed only when the
 * entry is written (on the journal's writer thread when there is one, not on the plant loop).
 *
 * @param payload the encoded message (not changed after it was handed over)
 */
record EncodedJson(byte[] payload) {
    private static final ObjectMapper MAPPER = new ObjectMapper();

    @JsonValue
    JsonNode tree() {
        try {
            return MAPPER.readTree(payload);
        } catch (IOException e) {
            throw new UncheckedIOException("plant journal: an encoded message did not parse back: " + e.getMessage(), e);
        }
    }
}
