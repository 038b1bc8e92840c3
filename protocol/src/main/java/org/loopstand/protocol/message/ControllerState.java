package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** What the controller is doing; offline is its last will. */
public enum ControllerState {
    REGULATING("regulating"),
    SUSPENDED("suspended"),
    OFF("off"),
    OFFLINE("offline");

    private final String wireName;

    ControllerState(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
