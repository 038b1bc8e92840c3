package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Start or stop an injected fault. */
public enum FaultAction {
    START("start"),
    STOP("stop");

    private final String wireName;

    FaultAction(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
