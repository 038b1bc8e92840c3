package org.loopstand.report.metrics;

import java.util.ArrayList;
import java.util.List;
import org.loopstand.report.model.TimeSeries;

/**
 * Descriptive statistics of an ACE record.
 *
 * <p>Mean and σ are over samples (σ is the population standard deviation, divided by n). Percentiles
 * of |ACE| are {@linkplain Percentiles nearest-rank}. Time in band uses zero-order hold: each sample
 * holds until the next one; the last sample holds for no time.
 *
 * @param samples       number of non-NaN samples
 * @param meanMw        mean ACE, MW
 * @param sigmaMw       population standard deviation, MW
 * @param p50AbsMw      50th percentile of |ACE|, MW
 * @param p90AbsMw      90th percentile of |ACE|, MW
 * @param p99AbsMw      99th percentile of |ACE|, MW
 * @param maxAbsMw      largest |ACE|, MW
 * @param timeInBandS   seconds with |ACE| in each band, see {@link #of}
 */
public record AceStatistics(int samples, double meanMw, double sigmaMw, double p50AbsMw, double p90AbsMw,
        double p99AbsMw, double maxAbsMw, List<Band> timeInBandS) {

    /**
     * Time spent in one band.
     *
     * @param lowerAbsMw lower bound on |ACE| (inclusive), MW
     * @param upperAbsMw upper bound on |ACE| (exclusive), MW; infinity for the last band
     * @param durationS  seconds spent there
     */
    public record Band(double lowerAbsMw, double upperAbsMw, double durationS) {
    }

    /**
     * @param aceMw             ACE samples, MW
     * @param bandThresholdsMw  ascending |ACE| thresholds, MW, e.g. {@code [10, 50]} gives the bands
     *                          [0, 10), [10, 50), [50, ∞)
     * @return the statistics
     */
    public static AceStatistics of(TimeSeries aceMw, double[] bandThresholdsMw) {
        for (int i = 0; i < bandThresholdsMw.length; i++) {
            if (!(bandThresholdsMw[i] > 0) || (i > 0 && bandThresholdsMw[i] <= bandThresholdsMw[i - 1])) {
                throw new IllegalArgumentException("ACE band thresholds must be positive and ascending, got "
                        + java.util.Arrays.toString(bandThresholdsMw));
            }
        }
        double sum = 0;
        int n = 0;
        for (int i = 0; i < aceMw.size(); i++) {
            if (!Double.isNaN(aceMw.value(i))) {
                sum += aceMw.value(i);
                n++;
            }
        }
        double mean = n == 0 ? Double.NaN : sum / n;
        double sq = 0;
        double[] abs = new double[aceMw.size()];
        double maxAbs = n == 0 ? Double.NaN : 0;
        for (int i = 0; i < aceMw.size(); i++) {
            double v = aceMw.value(i);
            abs[i] = Math.abs(v);
            if (!Double.isNaN(v)) {
                sq += (v - mean) * (v - mean);
                maxAbs = Math.max(maxAbs, abs[i]);
            }
        }
        double[] bandS = new double[bandThresholdsMw.length + 1];
        for (int i = 0; i + 1 < aceMw.size(); i++) {
            if (Double.isNaN(abs[i])) {
                continue;
            }
            int b = 0;
            while (b < bandThresholdsMw.length && abs[i] >= bandThresholdsMw[b]) {
                b++;
            }
            bandS[b] += (aceMw.timeMs(i + 1) - aceMw.timeMs(i)) / 1000.0;
        }
        List<Band> bands = new ArrayList<>();
        for (int b = 0; b < bandS.length; b++) {
            double lo = b == 0 ? 0 : bandThresholdsMw[b - 1];
            double hi = b == bandThresholdsMw.length ? Double.POSITIVE_INFINITY : bandThresholdsMw[b];
            bands.add(new Band(lo, hi, bandS[b]));
        }
        return new AceStatistics(n, mean, n == 0 ? Double.NaN : Math.sqrt(sq / n), Percentiles.nearestRank(abs, 50),
                Percentiles.nearestRank(abs, 90), Percentiles.nearestRank(abs, 99), maxAbs, List.copyOf(bands));
    }
}
