package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Whether a client's broker link is up; the offline form is registered as its last will.
 *
 * @param seq        per-publisher sequence number, ≥ 0
 * @param sourceTime epoch ms at the source, &gt; 0
 * @param clientId   MQTT client id, 1 to 256 characters, no control characters
 * @param state      online or offline
 */
public record LinkStatus(long seq, long sourceTime, String clientId, LinkState state) {
    public LinkStatus {
        Objects.requireNonNull(clientId, "clientId");
    }
}
