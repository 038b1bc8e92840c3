package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Whether a client's link to the broker is up (offline is also its last will). */
public enum LinkState {
    ONLINE("online"),
    OFFLINE("offline");

    private final String wireName;

    LinkState(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
