package org.loopstand.protocol.security;

import java.util.Map;

/**
 * Where security events go (refusals, connects, auth failures). Shaped like
 * {@code JournalWriter::append} so a journal can be passed directly. Fields never hold key
 * material or passwords.
 */
@FunctionalInterface
public interface SecurityEventSink {
    /** Discards events. */
    SecurityEventSink NONE = (tMs, kind, fields) -> { };

    /**
     * @param tMs    epoch ms of the event
     * @param kind   event kind, e.g. {@code security.refused}
     * @param fields event fields (plain values)
     */
    void append(long tMs, String kind, Object fields);

    /** Convenience for map-shaped fields. */
    default void event(long tMs, String kind, Map<String, ?> fields) {
        append(tMs, kind, fields);
    }
}
