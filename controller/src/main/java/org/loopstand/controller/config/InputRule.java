package org.loopstand.controller.config;


/**
 * Validation rule for one kind of input (all frequencies, all tie flows), from the {@code
 * controller.intake} section.
 *
 * @param maxAgeMs      largest age now − sourceTime, ms, &gt; 0
 * @param minValue      lowest plausible value (Hz or MW)
 * @param maxValue      highest plausible value (Hz or MW)
 * @param maxRatePerS   largest plausible change per second (Hz/s or MW/s); +∞ = off
 * @param frozenAfterMs source-time span (scenario ms) of identical samples that makes the value
 *                      frozen; 0 = off
 * @param frozenMinReadings fewest samples in that span, ≥ 2
 * @param frozenEpsilon largest difference counted as identical (Hz or MW), ≥ 0
 * @param policy        fallback when the latest value is not usable
 * @param holdMs        hold-last-good time past maxAgeMs, ms, ≥ 0
 */
public record InputRule(long maxAgeMs, double minValue, double maxValue, double maxRatePerS, long frozenAfterMs,
                        int frozenMinReadings, double frozenEpsilon, FallbackPolicy policy, long holdMs) {

    /** @return validation settings for one input named {@code inputName} */
    public InputValidationSettings toSettings(String inputName, long clockSkewLimitMs) {
        InputValidationSettings.Builder b = InputValidationSettings.builder(inputName).maxAgeMs(maxAgeMs)
                .range(minValue, maxValue).maxRatePerS(maxRatePerS).frozen(frozenAfterMs, frozenMinReadings, frozenEpsilon)
                .clockSkewLimitMs(clockSkewLimitMs);
        switch (policy) {
            case HOLD_LAST_GOOD -> b.holdLastGood(holdMs);
            case ALTERNATE_SOURCE -> b.alternateSource();
            default -> b.declareUnusable();
        }
        return b.build();
    }
}
