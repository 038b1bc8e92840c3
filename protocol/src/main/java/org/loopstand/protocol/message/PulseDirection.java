package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Direction a pulse moves the load reference. */
public enum PulseDirection {
    RAISE("raise"),
    LOWER("lower");

    private final String wireName;

    PulseDirection(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
