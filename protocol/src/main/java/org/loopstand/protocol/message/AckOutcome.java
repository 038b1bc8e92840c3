package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Whether a unit took a command. */
public enum AckOutcome {
    ACCEPTED("accepted"),
    REJECTED("rejected");

    private final String wireName;

    AckOutcome(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
