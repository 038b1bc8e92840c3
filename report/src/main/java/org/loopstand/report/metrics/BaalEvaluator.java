package org.loopstand.report.metrics;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.loopstand.report.model.TimeSeries;

/**
 * Balancing Authority ACE Limit (NERC BAL-001-2, re-derived from memory).
 *
 * <p>Frequency trigger limits {@code FTL_Low = FS − 3ε1}, {@code FTL_High = FS + 3ε1}. With clock-minute
 * averages of frequency FA and ACE:
 * <pre>
 *   BAAL_Low  = (−10·B · (FTL_Low − FS))  · (FTL_Low − FS)  / (FA − FS)   applies when FA &lt; FS
 *   BAAL_High = (−10·B · (FTL_High − FS)) · (FTL_High − FS) / (FA − FS)   applies when FA &gt; FS
 * </pre>
 * Both reduce to {@code ±(−10·B)·9ε1² / (FA − FS)}: the limit tightens as frequency moves away from
 * schedule and equals {@code −10·B·(∓3ε1)} at the trigger limit. A clock minute is an exceedance when
 * its ACE is below BAAL_Low or above BAAL_High; the run fails when an exceedance lasts more than
 * {@value #MAX_CONSECUTIVE_MINUTES} consecutive clock minutes. A minute with no data ends a run.
 */
public final class BaalEvaluator {
    /** Longest allowed run of consecutive exceeding clock minutes. */
    public static final int MAX_CONSECUTIVE_MINUTES = 30;

    private BaalEvaluator() {
    }

    /**
     * One clock minute.
     *
     * @param minuteStartMs start of the clock minute, epoch ms
     * @param aceMw         clock-minute mean ACE, MW
     * @param frequencyHz   clock-minute mean frequency, Hz
     * @param baalLowMw     BAAL_Low, MW (−∞ when FA ≥ FS: no low limit)
     * @param baalHighMw    BAAL_High, MW (+∞ when FA ≤ FS: no high limit)
     * @param exceeded      true when ACE is outside [BAAL_Low, BAAL_High]
     */
    public record Minute(long minuteStartMs, double aceMw, double frequencyHz, double baalLowMw, double baalHighMw,
            boolean exceeded) {
    }

    /**
     * @param minutes                  every clock minute evaluated
     * @param exceedanceMinutes        minutes in exceedance
     * @param longestExceedanceMinutes longest run of consecutive exceeding minutes
     * @param longestRunStartMs        start of that run, epoch ms; −1 when none
     * @param passes                   true when no run exceeds {@value #MAX_CONSECUTIVE_MINUTES} minutes
     */
    public record Result(List<Minute> minutes, int exceedanceMinutes, int longestExceedanceMinutes,
            long longestRunStartMs, boolean passes) {
    }

    /** BAAL_Low in MW at clock-minute frequency {@code faHz}; −∞ when FA ≥ FS. */
    public static double baalLowMw(double faHz, double fsHz, double biasMwPer0p1Hz, double epsilon1Hz) {
        if (!(faHz < fsHz)) {
            return Double.NEGATIVE_INFINITY;
        }
        double d = -3.0 * epsilon1Hz; // FTL_Low − FS
        return (-10.0 * biasMwPer0p1Hz * d) * d / (faHz - fsHz);
    }

    /** BAAL_High in MW at clock-minute frequency {@code faHz}; +∞ when FA ≤ FS. */
    public static double baalHighMw(double faHz, double fsHz, double biasMwPer0p1Hz, double epsilon1Hz) {
        if (!(faHz > fsHz)) {
            return Double.POSITIVE_INFINITY;
        }
        double d = 3.0 * epsilon1Hz; // FTL_High − FS
        return (-10.0 * biasMwPer0p1Hz * d) * d / (faHz - fsHz);
    }

    /**
     * @param aceMw                ACE samples, MW (NERC sign)
     * @param frequencyHz          frequency samples, Hz
     * @param scheduledFrequencyHz FS, Hz
     * @param biasMwPer0p1Hz       B, MW/0.1 Hz, negative
     * @param epsilon1Hz           ε1, Hz, &gt; 0
     * @return the evaluation
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
        List<Minute> minutes = new ArrayList<>();
        int exceeding = 0;
        int run = 0;
        long runStart = -1;
        int longest = 0;
        long longestStart = -1;
        long previousMinute = Long.MIN_VALUE;
        for (Map.Entry<Long, Double> e : ace.entrySet()) {
            Double fa = freq.get(e.getKey());
            if (fa == null) {
                continue;
            }
            double low = baalLowMw(fa, scheduledFrequencyHz, biasMwPer0p1Hz, epsilon1Hz);
            double high = baalHighMw(fa, scheduledFrequencyHz, biasMwPer0p1Hz, epsilon1Hz);
            double a = e.getValue();
            boolean exceeded = a < low || a > high;
            long startMs = e.getKey() * ClockMinutes.MINUTE_MS;
            minutes.add(new Minute(startMs, a, fa, low, high, exceeded));
            if (exceeded) {
                exceeding++;
                if (run > 0 && e.getKey() == previousMinute + 1) {
                    run++;
                } else {
                    run = 1;
                    runStart = startMs;
                }
                if (run > longest) {
                    longest = run;
                    longestStart = runStart;
                }
            } else {
                run = 0;
            }
            previousMinute = e.getKey();
        }
        return new Result(List.copyOf(minutes), exceeding, longest, longestStart, longest <= MAX_CONSECUTIVE_MINUTES);
    }
}
