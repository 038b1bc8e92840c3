package org.loopstand.protocol.bus;

import java.util.Objects;

/**
 * One message to publish.
 *
 * @param topic          full topic (built by the topic tree, never concatenated by hand)
 * @param payload        encoded bytes
 * @param qos            delivery guarantee
 * @param retained       keep as the topic's last value at the broker
 * @param expirySeconds  MQTT 5 message expiry interval, s; 0 = never expires
 */
public record OutboundMessage(String topic, byte[] payload, Qos qos, boolean retained, long expirySeconds) {
    public OutboundMessage {
        Objects.requireNonNull(topic, "topic");
        Objects.requireNonNull(payload, "payload");
        Objects.requireNonNull(qos, "qos");
        if (expirySeconds < 0 || expirySeconds > 0xFFFF_FFFFL) {
            throw new IllegalArgumentException("expirySeconds must be in [0, 4294967295], got " + expirySeconds);
        }
    }

    public static OutboundMessage of(String topic, byte[] payload, Qos qos) {
        return new OutboundMessage(topic, payload, qos, false, 0);
    }
}
