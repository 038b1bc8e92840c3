package org.loopstand.controller.runtime;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.Base64;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The controller journal's {@code input} entry (schema version 2): one per message the intake took from
 * its queue, refused ones included, written before anything the message caused. Its time is the
 * controller's clock when the message was routed; {@code atMs} is the arrival stamp the intake put on
 * it (the time its ages and skews are reckoned from), {@code topic} the topic, and the payload exactly
 * as it came: {@code payload} as text when it is UTF-8 (every wire message is JSON), else
 * {@code payloadBase64}. Exact replay feeds these back (docs/replay.md).
 */
public final class InputEntries {
    /** Entry kind. */
    public static final String KIND = "input";
    /** Entry kind of the cycle clock's start (t0 and period of the cycle schedule, ns). */
    public static final String KIND_CYCLE_CLOCK = "cycleClock";

    private InputEntries() {
    }

    /** @return the entry's fields, in a fixed order */
    static Map<String, Object> fields(String topic, byte[] payload, long receivedAtMs) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("topic", topic);
        f.put("atMs", receivedAtMs);
        String text = utf8(payload);
        if (text != null) {
            f.put("payload", text);
        } else {
            f.put("payloadBase64", Base64.getEncoder().encodeToString(payload));
        }
        return f;
    }

    /**
     * @param entry an {@code input} entry's fields
     * @return the payload bytes as they came
     * @throws IllegalArgumentException when the entry holds no payload
     */
    public static byte[] payloadOf(JsonNode entry) {
        JsonNode text = entry.get("payload");
        if (text != null && text.isTextual()) {
            return text.asText().getBytes(StandardCharsets.UTF_8);
        }
        JsonNode b64 = entry.get("payloadBase64");
        if (b64 != null && b64.isTextual()) {
            return Base64.getDecoder().decode(b64.asText());
        }
        throw new IllegalArgumentException("input entry has neither 'payload' nor 'payloadBase64'");
    }

    private static String utf8(byte[] payload) {
        try {
            CharBuffer c = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(payload));
            return c.toString();
        } catch (CharacterCodingException e) {
            return null; // not text: kept as base64 so that replay gets the same bytes
        }
    }
}
