package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** IEC 61850-7-3 validity of a measured value. */
public enum Validity {
    GOOD("good"),
    QUESTIONABLE("questionable"),
    INVALID("invalid");

    private final String wireName;

    Validity(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
