package org.loopstand.controller.pulsetest.plan;

/**
 * How the programme is sent and measured.
 *
 * @param leadInS            quiet time before the first step, s, ≥ 0 (gives the baseline)
 * @param noiseThresholdMw   output change that counts as movement, MW, &gt; 0
 * @param averagingS         window for baseline (before a step) and final value (end of a step), s, &gt; 0
 * @param settleBandPct      settling band, % of the requested change, ≥ 0
 * @param settleBandMinMw    settling band at least this wide, MW, &gt; 0
 * @param maxPulseMs         longest single pulse sent; longer moves are split, ms, in [1, 600000]
 * @param pulseGapMs         pause between split pulses, ms, ≥ 0
 * @param waitFactor         wait = expected move time × this + extraWaitS, ≥ 1
 * @param extraWaitS         extra wait after each move, s, ≥ 0
 * @param commandValidityMs  a pulse not started within this time after issue must not act, ms, ≥ 100
 * @param telemetryLossScans telemetry silent for more than this many scan periods aborts the test, ≥ 1
 * @param settledForS        a step ends only when the unit's own output (governor answer removed) has
 *                           stayed within ± the settling band of its mean this long, s, &gt; 0
 * @param settleTimeoutS     or when this long has passed after the step's window without that, s, ≥ 0
 * @param steadyForS         before the first step: output and frequency must be steady this long, s, &gt; 0
 * @param steadyOutputBandMw steady output: every reading within ± this of their mean, MW, &gt; 0
 * @param steadyFrequencyBandHz steady frequency: every reading within ± this of nominal, Hz, &gt; 0
 * @param steadyTimeoutS     the test waits at most this long for a steady unit, then refuses, s, ≥ 0
 */
public record PlanSettings(double leadInS, double noiseThresholdMw, double averagingS, double settleBandPct,
        double settleBandMinMw, long maxPulseMs, long pulseGapMs, double waitFactor, double extraWaitS,
        long commandValidityMs, int telemetryLossScans, double settledForS, double settleTimeoutS,
        double steadyForS, double steadyOutputBandMw, double steadyFrequencyBandHz, double steadyTimeoutS) {
    /**
     * Defaults used for every key a plan leaves out. The settle and steadiness figures are common practice,
     * no source: 20 s without drift, ±0.5 MW and ±50 mHz for 30 s, and two minutes of patience.
     */
    public static final PlanSettings DEFAULTS = new PlanSettings(20, 0.3, 5, 5, 0.5, 10_000, 500, 1.5, 20, 3_000, 5,
            20, 120, 30, 0.5, 0.05, 120);
}
