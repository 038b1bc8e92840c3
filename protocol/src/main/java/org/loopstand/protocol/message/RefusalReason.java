package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Why a unit refused a command. */
public enum RefusalReason {
    EXPIRED("expired"),
    DUPLICATE("duplicate"),
    OUT_OF_ORDER("outOfOrder"),
    NOT_IN_REMOTE("notInRemote"),
    UNIT_OFFLINE("unitOffline"),
    AT_LIMIT("atLimit"),
    WRONG_CONTROLLER("wrongController"),
    WRONG_EPOCH("wrongEpoch"),
    PULSE_TOO_LONG("pulseTooLong"),
    MALFORMED("malformed"),
    BAD_SIGNATURE("badSignature"),
    MISSING_SIGNATURE("missingSignature"),
    UNKNOWN_KEY("unknownKey"),
    REPLAYED("replayed"),
    /** validUntil − issuedAt not in (0, the stated bound], see {@code CommandTimeRules} */
    BAD_LIFETIME("badLifetime"),
    /** issuedAt (or the epoch) further ahead of the unit's clock than the stated allowance */
    NOT_YET_VALID("notYetValid");

    private final String wireName;

    RefusalReason(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
