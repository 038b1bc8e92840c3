package org.loopstand.controller.intake;

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
 * @param frozenCount       consecutive identical samples with advancing source time that make
 *                          the input frozen, 0 = off or ≥ 2, default 0
 * @param frozenEpsilon     largest difference counted as identical (input unit), ≥ 0, default 0
 * @param policy            fallback when the latest value is not usable, default DECLARE_UNUSABLE
 * @param holdMs            hold-last-good time after the age limit, ms, ≥ 0, default 0
 * @param clockSkewLimitMs  |source time − receipt time| beyond this is reported as clock skew, ms,
 *                          &gt; 0, default 2000; a source ahead by more is not used
 */
public record InputValidationSettings(String inputName, long maxAgeMs, double minValue, double maxValue,
                                      double maxRatePerS, int frozenCount, double frozenEpsilon,
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
        private int frozenCount;
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
        public Builder frozen(int count, double epsilon) { frozenCount = count; frozenEpsilon = epsilon; return this; }
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
            if (frozenCount != 0 && frozenCount < 2) {
                p.add("frozenCount must be 0 (off) or >= 2, was " + frozenCount);
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
            return new InputValidationSettings(inputName, maxAgeMs, minValue, maxValue, maxRatePerS, frozenCount,
                    frozenEpsilon, policy, holdMs, clockSkewLimitMs);
        }
    }
}
