package org.loopstand.report.metrics;

import java.util.Map;
import java.util.TreeMap;
import org.loopstand.report.model.TimeSeries;

/**
 * Control Performance Standard 1 (NERC BAL-001-2, from memory).
 *
 * <p>For each clock minute with both ACE and frequency samples:
 * {@code CF_min = (ACE_min / (−10·B)) · ΔF_min} with {@code ΔF = FA − FS}; then
 * {@code CF = mean(CF_min) / ε1²} and {@code CPS1 = (2 − CF) · 100 %}. CPS1 ≥ 100 % passes. The
 * standard evaluates a rolling 12 months; a rehearsal evaluates its own run, so the figure is
 * indicative only.
 */
public final class Cps1Calculator {
    private Cps1Calculator() {
    }

    /**
     * @param minutes     clock minutes used (with both ACE and frequency)
     * @param meanCfHz2   mean of the clock-minute CF terms, Hz²
     * @param cf          compliance factor, mean(CF_min) / ε1², dimensionless
     * @param cps1Pct     CPS1, %
     * @param passes      true when CPS1 ≥ 100 %
     */
    public record Result(int minutes, double meanCfHz2, double cf, double cps1Pct, boolean passes) {
    }

    /**
     * @param aceMw                 ACE samples, MW (NERC sign: negative = under-generation)
     * @param frequencyHz           actual frequency samples, Hz
     * @param scheduledFrequencyHz  scheduled frequency FS, Hz
     * @param biasMwPer0p1Hz        frequency bias B, MW/0.1 Hz, negative
     * @param epsilon1Hz            ε1 of the interconnection, Hz, &gt; 0
     * @return the result; with no usable minute, NaN figures and {@code passes = false}
     */
    public static Result evaluate(TimeSeries aceMw, TimeSeries frequencyHz, double scheduledFrequencyHz,
            double biasMwPer0p1Hz, double epsilon1Hz) {
        if (!(biasMwPer0p1Hz < 0)) {
            throw new IllegalArgumentException("bias B must be negative (MW/0.1 Hz), got " + biasMwPer0p1Hz);
        }
        if (!(epsilon1Hz > 0)) {
            throw new IllegalArgumentException("epsilon1Hz must be positive, got " + epsilon1Hz);
        }
        TreeMap<Long, Double> ace = ClockMinutes.averages(aceMw, ClockMinutes.MINUTE_MS);
        TreeMap<Long, Double> freq = ClockMinutes.averages(frequencyHz, ClockMinutes.MINUTE_MS);
        double sum = 0;
        int n = 0;
        for (Map.Entry<Long, Double> e : ace.entrySet()) {
            Double f = freq.get(e.getKey());
            if (f == null) {
                continue;
            }
            sum += (e.getValue() / (-10.0 * biasMwPer0p1Hz)) * (f - scheduledFrequencyHz);
            n++;
        }
        if (n == 0) {
            return new Result(0, Double.NaN, Double.NaN, Double.NaN, false);
        }
        double meanCf = sum / n;
        double cf = meanCf / (epsilon1Hz * epsilon1Hz);
        double cps1 = (2.0 - cf) * 100.0;
        return new Result(n, meanCf, cf, cps1, cps1 >= 100.0);
    }
}
