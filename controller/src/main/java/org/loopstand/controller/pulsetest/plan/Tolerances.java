package org.loopstand.controller.pulsetest.plan;

/**
 * What the measured response is judged against. Percentages are of the declared (expected) figure.
 *
 * @param deadTimeMaxS       longest dead time to first movement (and turn-round delay), s
 * @param rampPct            achieved ramp within ± this of the expected ramp, %
 * @param gainPct            gain (MW per pulse-second) within ± this of the declared pulse rate, %
 * @param shortPulseGainPct  the same for single short pulses (coarser: few MW, scan quantisation), %
 * @param overshootMaxPct    largest overshoot beyond the final value, % of the measured change
 * @param settlingAllowanceS settling time may exceed the expected move time by at most this, s
 * @param finalErrorPct      final error within ± this of the requested change, %
 * @param finalErrorMinMw    the final error band is at least this wide, MW
 * @param holdDriftMaxMw     largest output drift during a hold, MW
 * @param asymmetryMaxPct    raise and lower gains (and ramps) differ by at most this, % of their mean
 */
public record Tolerances(double deadTimeMaxS, double rampPct, double gainPct, double shortPulseGainPct,
        double overshootMaxPct, double settlingAllowanceS, double finalErrorPct, double finalErrorMinMw,
        double holdDriftMaxMw, double asymmetryMaxPct) {
    /** Defaults used for every key a plan leaves out (common practice, no source: plan-specific in reality). */
    public static final Tolerances DEFAULTS = new Tolerances(15, 15, 10, 30, 10, 60, 10, 0.5, 1.0, 15);
}
