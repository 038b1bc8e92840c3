package org.loopstand.controller.ace;

/** Which terms of the ACE an area controls on. */
public enum AceMode {
    /** Interchange deviation plus frequency bias term: each area answers for its own imbalance. */
    TIE_LINE_BIAS,
    /** Frequency term only ({@code −10B·Δf}); for an isolated area or a single frequency keeper. */
    FLAT_FREQUENCY,
    /** Interchange deviation only ({@code ΔNI}); holds schedules, ignores frequency. */
    FLAT_TIE_LINE
}
