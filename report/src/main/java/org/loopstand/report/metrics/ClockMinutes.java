package org.loopstand.report.metrics;

import java.util.Map;
import java.util.TreeMap;
import org.loopstand.report.model.TimeSeries;

/** Clock-minute and clock-interval averaging shared by the performance measures. */
public final class ClockMinutes {
    /** One clock minute, ms. */
    public static final long MINUTE_MS = 60_000L;

    private ClockMinutes() {
    }

    /**
     * Averages the samples falling in each aligned interval [k·intervalMs, (k+1)·intervalMs) of epoch
     * time (UTC clock minutes for 60,000 ms; quarter hours for 900,000 ms). NaN samples are skipped;
     * an interval without samples is absent.
     *
     * @param series     the samples
     * @param intervalMs interval length, ms, ≥ 1
     * @return interval index k → mean value, in ascending k
     */
    public static TreeMap<Long, Double> averages(TimeSeries series, long intervalMs) {
        if (intervalMs < 1) {
            throw new IllegalArgumentException("intervalMs must be ≥ 1, got " + intervalMs);
        }
        TreeMap<Long, double[]> sums = new TreeMap<>();
        for (int i = 0; i < series.size(); i++) {
            double v = series.value(i);
            if (Double.isNaN(v)) {
                continue;
            }
            double[] s = sums.computeIfAbsent(Math.floorDiv(series.timeMs(i), intervalMs), k -> new double[2]);
            s[0] += v;
            s[1] += 1;
        }
        TreeMap<Long, Double> out = new TreeMap<>();
        for (Map.Entry<Long, double[]> e : sums.entrySet()) {
            out.put(e.getKey(), e.getValue()[0] / e.getValue()[1]);
        }
        return out;
    }
}
