package org.loopstand.controller.pulsetest.plan;

/**
 * A move size, either in MW or in percent of the unit's regulating range.
 *
 * @param value   size, &gt; 0
 * @param percent true when {@code value} is % of the regulating range (max − min)
 */
public record StepSize(double value, boolean percent) {
    /** @return the size in MW for a regulating range of {@code regulatingRangeMw} */
    public double toMw(double regulatingRangeMw) {
        return percent ? value / 100.0 * regulatingRangeMw : value;
    }

    @Override
    public String toString() {
        return percent ? value + " % of range" : value + " MW";
    }
}
