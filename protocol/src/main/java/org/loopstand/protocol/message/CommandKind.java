package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** A timed raise/lower pulse or an absolute setpoint. */
public enum CommandKind {
    PULSE("pulse"),
    SETPOINT("setpoint");

    private final String wireName;

    CommandKind(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
