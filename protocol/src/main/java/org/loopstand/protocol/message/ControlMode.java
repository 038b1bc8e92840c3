package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Who may move a unit: the remote controller, the local operator, or nobody. */
public enum ControlMode {
    REMOTE("remote"),
    LOCAL("local"),
    OFF("off");

    private final String wireName;

    ControlMode(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
