package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Whether a unit is connected and producing. */
public enum UnitStatus {
    ONLINE("online"),
    OFFLINE("offline"),
    TRIPPED("tripped");

    private final String wireName;

    UnitStatus(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
