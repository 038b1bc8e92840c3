package org.loopstand.report.metrics;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.loopstand.report.model.TimeSeries;

/**
 * Frequency restoration control error (FRCE) over 15-minute intervals, in the style of the FRCE
 * target parameters of Commission Regulation (EU) 2017/1485 (SOGL) Annex III (from memory): the
 * FRCE is averaged over each aligned quarter hour (the time to restore frequency) and the interval
 * means are counted outside a level 1 and a level 2 range. The ranges are parameters; the regulation's
 * targets (at most about 30 % of intervals outside level 1 and 5 % outside level 2 over a year, from
 * memory) are for a year of data, so a rehearsal's figures are indicative only.
 *
 * <p>The FRCE is the ACE of an LFC area (MW) or the frequency deviation of a synchronous area (Hz); the
 * unit follows the input. Percentiles are nearest-rank over the interval means.
 *
 * @param intervals         every interval with data
 * @param meanOfMeans       mean of the interval means, input unit
 * @param sigmaOfMeans      population σ of the interval means, input unit
 * @param p1, p5, p10, p90, p95, p99 nearest-rank percentiles of the (signed) interval means
 * @param outsideLevel1     intervals with |mean| &gt; level 1 range
 * @param outsideLevel2     intervals with |mean| &gt; level 2 range
 * @param outsideLevel1Pct  share outside level 1, %
 * @param outsideLevel2Pct  share outside level 2, %
 */
public record FrceStatistics(List<Interval> intervals, double meanOfMeans, double sigmaOfMeans, double p1, double p5,
        double p10, double p90, double p95, double p99, int outsideLevel1, int outsideLevel2, double outsideLevel1Pct,
        double outsideLevel2Pct) {

    /** Length of an evaluation interval: 15 minutes, ms. */
    public static final long INTERVAL_MS = 15 * 60_000L;

    /**
     * @param startMs start of the quarter hour, epoch ms
     * @param mean    mean FRCE over the interval, input unit
     */
    public record Interval(long startMs, double mean) {
    }

    /**
     * @param frce        FRCE samples (MW or Hz)
     * @param level1Range level 1 range, half width, input unit, &gt; 0
     * @param level2Range level 2 range, half width, input unit, ≥ level 1
     * @return the statistics
     */
    public static FrceStatistics of(TimeSeries frce, double level1Range, double level2Range) {
        if (!(level1Range > 0) || !(level2Range >= level1Range)) {
            throw new IllegalArgumentException("FRCE ranges need 0 < level1 ≤ level2, got level1=" + level1Range
                    + ", level2=" + level2Range);
        }
        TreeMap<Long, Double> means = ClockMinutes.averages(frce, INTERVAL_MS);
        List<Interval> intervals = new ArrayList<>();
        double[] values = new double[means.size()];
        int i = 0;
        int out1 = 0;
        int out2 = 0;
        double sum = 0;
        for (Map.Entry<Long, Double> e : means.entrySet()) {
            intervals.add(new Interval(e.getKey() * INTERVAL_MS, e.getValue()));
            values[i++] = e.getValue();
            sum += e.getValue();
            if (Math.abs(e.getValue()) > level1Range) {
                out1++;
            }
            if (Math.abs(e.getValue()) > level2Range) {
                out2++;
            }
        }
        int n = values.length;
        double mean = n == 0 ? Double.NaN : sum / n;
        double sq = 0;
        for (double v : values) {
            sq += (v - mean) * (v - mean);
        }
        return new FrceStatistics(List.copyOf(intervals), mean, n == 0 ? Double.NaN : Math.sqrt(sq / n),
                Percentiles.nearestRank(values, 1), Percentiles.nearestRank(values, 5),
                Percentiles.nearestRank(values, 10), Percentiles.nearestRank(values, 90),
                Percentiles.nearestRank(values, 95), Percentiles.nearestRank(values, 99), out1, out2,
                n == 0 ? Double.NaN : 100.0 * out1 / n, n == 0 ? Double.NaN : 100.0 * out2 / n);
    }
}
