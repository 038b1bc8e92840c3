package org.loopstand.controller.config;

import java.util.ArrayList;
import java.util.List;

/**
 * Validation settings of one input. Build with {@link #builder(String)}.
 *
 * @param inputName         name used in reasons, e.g. {@code frequency:areaA}
 * @param maxAgeMs          largest age (controller now − source time), ms, &gt; 0, default 10000
 * @param minValue          lowest plausible value (input unit), default −∞
 * @param maxValue          highest plausible value (input unit), default +∞
 * @param maxRatePerS       largest plausible change per second between consecutive samples
 *                          (input unit/s), &gt; 0, default +∞ (off)
 * @param frozenAfterMs     source-time span (scenario time) of identical samples that makes the
 *                          input frozen, ms, 0 = off or &gt; 0, default 0 (the intake's FrozenDetector)
 * @param frozenMinReadings fewest samples in that span, ≥ 2, default 2
 * @param frozenEpsilon     largest difference counted as identical (input unit), ≥ 0, default 0
 * @param policy            fallback when the latest value is not usable, default DECLARE_UNUSABLE
 * @param holdMs            hold-last-good time after the age limit, ms, ≥ 0, default 0
 * @param clockSkewLimitMs  |source time − receipt time| beyond this is reported as clock skew, ms,
 *                          &gt; 0, default 2000; a source ahead by more is not used
 */
public record InputValidationSettings(String inputName, long maxAgeMs, double minValue, double maxValue,
                                      double maxRatePerS, long frozenAfterMs, int frozenMinReadings,
                                      double frozenEpsilon,
                                      FallbackPolicy policy, long holdMs, long clockSkewLimitMs) {

    public static Builder builder(String inputName) {
        return new Builder(inputName);
    }

    public static final class Builder {
        private final String inputName;
        private long maxAgeMs = 10_000;
        private double minValue = Double.NEGATIVE_INFINITY;
        private double maxValue = Double.POSITIVE_INFINITY;
        private double maxRatePerS = Double.POSITIVE_INFINITY;
        private long frozenAfterMs;
        private int frozenMinReadings = 2;
        private double frozenEpsilon;
        private FallbackPolicy policy = FallbackPolicy.DECLARE_UNUSABLE;
        private long holdMs;
        private long clockSkewLimitMs = 2_000;

        private Builder(String inputName) {
            this.inputName = inputName;
        }

        public Builder maxAgeMs(long v) { maxAgeMs = v; return this; }
        public Builder range(double min, double max) { minValue = min; maxValue = max; return this; }
        public Builder maxRatePerS(double v) { maxRatePerS = v; return this; }
        /** Frozen after {@code afterMs} of source time within {@code epsilon}, at least {@code minReadings} samples. */
        public Builder frozen(long afterMs, int minReadings, double epsilon) {
            frozenAfterMs = afterMs;
            frozenMinReadings = minReadings;
            frozenEpsilon = epsilon;
            return this;
        }
        public Builder holdLastGood(long holdMs) { policy = FallbackPolicy.HOLD_LAST_GOOD; this.holdMs = holdMs; return this; }
        public Builder alternateSource() { policy = FallbackPolicy.ALTERNATE_SOURCE; return this; }
        public Builder declareUnusable() { policy = FallbackPolicy.DECLARE_UNUSABLE; return this; }
        public Builder clockSkewLimitMs(long v) { clockSkewLimitMs = v; return this; }

        public InputValidationSettings build() {
            List<String> p = new ArrayList<>();
            if (inputName == null || inputName.isBlank()) {
                p.add("inputName must not be blank");
            }
            if (maxAgeMs <= 0) {
                p.add("maxAgeMs must be > 0, was " + maxAgeMs);
            }
            if (Double.isNaN(minValue) || Double.isNaN(maxValue) || !(minValue < maxValue)) {
                p.add("range needs min < max, was " + minValue + ".." + maxValue);
            }
            if (!(maxRatePerS > 0)) {
                p.add("maxRatePerS must be > 0, was " + maxRatePerS);
            }
            if (frozenAfterMs < 0) {
                p.add("frozenAfterMs must be 0 (off) or > 0, was " + frozenAfterMs);
            }
            if (frozenAfterMs > 0 && frozenMinReadings < 2) {
                p.add("frozenMinReadings must be >= 2, was " + frozenMinReadings);
            }
            if (!(frozenEpsilon >= 0)) {
                p.add("frozenEpsilon must be >= 0, was " + frozenEpsilon);
            }
            if (holdMs < 0) {
                p.add("holdMs must be >= 0, was " + holdMs);
            }
            if (clockSkewLimitMs <= 0) {
                p.add("clockSkewLimitMs must be > 0, was " + clockSkewLimitMs);
            }
            if (!p.isEmpty()) {
                throw new IllegalArgumentException("input " + inputName + " settings invalid: " + String.join("; ", p));
            }
            return new InputValidationSettings(inputName, maxAgeMs, minValue, maxValue, maxRatePerS, frozenAfterMs, frozenMinReadings,
                    frozenEpsilon, policy, holdMs, clockSkewLimitMs);
        }
    }
}
