package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** IEC 61850-7-3 detail quality, source and test flags of a measured value. */
public enum QualityFlag {
    OVERFLOW("overflow"),
    OUT_OF_RANGE("outOfRange"),
    BAD_REFERENCE("badReference"),
    OSCILLATORY("oscillatory"),
    FAILURE("failure"),
    OLD_DATA("oldData"),
    INCONSISTENT("inconsistent"),
    INACCURATE("inaccurate"),
    SUBSTITUTED("substituted"),
    TEST("test"),
    OPERATOR_BLOCKED("operatorBlocked");

    private final String wireName;

    QualityFlag(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire (camelCase) */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
