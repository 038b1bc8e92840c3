package org.loopstand.controller.intake;

/** Why a value is not (fully) trusted. Codes are stable; {@link #code()} is what goes on the wire. */
public enum ValidationReason {
    NO_DATA("noData"),
    STALE("stale"),
    BAD_QUALITY("badQuality"),
    OUT_OF_RANGE("outOfRange"),
    RATE_OF_CHANGE("rateOfChange"),
    FROZEN("frozen"),
    SEQ_GAP("seqGap"),
    DUPLICATE("duplicate"),
    OUT_OF_ORDER("outOfOrder"),
    CLOCK_SKEW_AHEAD("clockSkewAhead"),
    CLOCK_SKEW_BEHIND("clockSkewBehind"),
    HELD_LAST_GOOD("heldLastGood"),
    ALTERNATE_SOURCE("alternateSource"),
    HOLD_EXPIRED("holdExpired"),
    /** the two ends of a tie report flows that contradict each other */
    ENDS_DISAGREE("endsDisagree");

    private final String code;

    ValidationReason(String code) {
        this.code = code;
    }

    public String code() {
        return code;
    }
}
