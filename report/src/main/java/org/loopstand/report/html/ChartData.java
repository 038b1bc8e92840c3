package org.loopstand.report.html;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.Histogram;
import org.loopstand.report.model.TimeSeries;

/**
 * Turns the model's charts into the column arrays uPlot draws: one shared x column in seconds since
 * the run start and one column per series, null where a series has no sample at that time.
 *
 * <p>Long series are thinned to at most {@value #MAX_POINTS_PER_SERIES} points by keeping each time
 * bucket's lowest and highest sample, so peaks (a frequency nadir, a latency spike) stay visible.
 */
final class ChartData {
    /** Upper bound of points per series after thinning. */
    static final int MAX_POINTS_PER_SERIES = 4000;

    private ChartData() {
    }

    /** @return the chart as a JSON-ready map (title, yLabel, stepped, names, units, data columns) */
    static Map<String, Object> chart(Chart chart, long startMs) {
        List<TimeSeries> thinned = new ArrayList<>();
        TreeSet<Long> times = new TreeSet<>();
        for (TimeSeries s : chart.series()) {
            TimeSeries t = thin(s, MAX_POINTS_PER_SERIES);
            thinned.add(t);
            for (int i = 0; i < t.size(); i++) {
                times.add(t.timeMs(i));
            }
        }
        long[] xs = times.stream().mapToLong(Long::longValue).toArray();
        List<Object> columns = new ArrayList<>();
        List<Double> x = new ArrayList<>(xs.length);
        for (long t : xs) {
            x.add((t - startMs) / 1000.0);
        }
        columns.add(x);
        List<String> names = new ArrayList<>();
        List<String> units = new ArrayList<>();
        for (TimeSeries s : thinned) {
            Double[] col = new Double[xs.length];
            for (int i = 0; i < s.size(); i++) {
                int at = Arrays.binarySearch(xs, s.timeMs(i));
                double v = s.value(i);
                col[at] = Double.isFinite(v) ? v : null;
            }
            columns.add(Arrays.asList(col));
            names.add(s.name());
            units.add(s.unit());
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("title", chart.title());
        out.put("yLabel", chart.yLabel());
        out.put("stepped", chart.stepped());
        out.put("names", names);
        out.put("units", units);
        out.put("data", columns);
        return out;
    }

    /** @return the histogram as a JSON-ready map (title, unit, labels, counts) */
    static Map<String, Object> histogram(Histogram h) {
        List<String> labels = new ArrayList<>();
        for (double b : h.upperBounds()) {
            labels.add(b == Math.rint(b) && Math.abs(b) < 1e15 ? Long.toString((long) b) : Double.toString(b));
        }
        List<Long> counts = new ArrayList<>();
        for (long c : h.counts()) {
            counts.add(c);
        }
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("title", h.title());
        out.put("unit", h.unit());
        out.put("labels", labels);
        out.put("counts", counts);
        return out;
    }

    /**
     * Keeps the first and last sample and, in each of {@code maxPoints/2} equal time buckets, the
     * samples with the lowest and highest value (in time order).
     */
    static TimeSeries thin(TimeSeries s, int maxPoints) {
        int n = s.size();
        if (n <= maxPoints) {
            return s;
        }
        int buckets = Math.max(1, (maxPoints - 2) / 2);
        long t0 = s.timeMs(0);
        long span = Math.max(1, s.timeMs(n - 1) - t0);
        boolean[] keep = new boolean[n];
        keep[0] = true;
        keep[n - 1] = true;
        int[] lo = new int[buckets];
        int[] hi = new int[buckets];
        Arrays.fill(lo, -1);
        Arrays.fill(hi, -1);
        for (int i = 0; i < n; i++) {
            double v = s.value(i);
            if (Double.isNaN(v)) {
                continue;
            }
            int b = (int) Math.min(buckets - 1, (s.timeMs(i) - t0) * buckets / span);
            if (lo[b] < 0 || v < s.value(lo[b])) {
                lo[b] = i;
            }
            if (hi[b] < 0 || v > s.value(hi[b])) {
                hi[b] = i;
            }
        }
        for (int b = 0; b < buckets; b++) {
            if (lo[b] >= 0) {
                keep[lo[b]] = true;
                keep[hi[b]] = true;
            }
        }
        int m = 0;
        for (boolean k : keep) {
            m += k ? 1 : 0;
        }
        long[] t = new long[m];
        double[] v = new double[m];
        int j = 0;
        for (int i = 0; i < n; i++) {
            if (keep[i]) {
                t[j] = s.timeMs(i);
                v[j++] = s.value(i);
            }
        }
        return new TimeSeries(s.name(), s.unit(), t, v);
    }
}
