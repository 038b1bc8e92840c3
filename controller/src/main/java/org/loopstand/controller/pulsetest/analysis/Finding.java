package org.loopstand.controller.pulsetest.analysis;

/** The plain-words conclusions a failed row can lead to; a run's findings are the distinct ones. */
public enum Finding {
    NO_MOVEMENT("does not follow pulses: no movement beyond the noise threshold"),
    OPPOSITE_DIRECTION("moves opposite to the command (raise and lower swapped?)"),
    RAMP_TOO_SLOW("ramps slower than declared"),
    RAMP_TOO_FAST("ramps faster than declared"),
    GAIN_LOW("moves less per pulse-second than its declared pulse rate"),
    GAIN_HIGH("moves more per pulse-second than its declared pulse rate"),
    DEAD_TIME_LONG("answers late: dead time too long"),
    OVERSHOOT("overshoots the requested value"),
    SLOW_SETTLING("takes too long to settle"),
    FINAL_ERROR("does not arrive at the requested value"),
    DRIFT("drifts while no pulses are sent"),
    ASYMMETRIC("answers raise and lower differently"),
    REFUSED("refused commands"),
    UNANSWERED("left commands unanswered"),
    NO_TURN("turns round late after a reversal");

    private final String text;

    Finding(String text) {
        this.text = text;
    }

    /** @return the finding in plain words */
    public String text() {
        return text;
    }
}
