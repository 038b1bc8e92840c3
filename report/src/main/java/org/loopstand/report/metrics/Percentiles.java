package org.loopstand.report.metrics;

import java.util.Arrays;

/**
 * Nearest-rank percentiles: the p-th percentile of n values is the value of rank ⌈p/100 · n⌉ in
 * ascending order (rank at least 1). Chosen because a reader can work it out by hand.
 */
public final class Percentiles {
    private Percentiles() {
    }

    /**
     * @param values the values (NaN skipped); not modified
     * @param pct    percentile, 0 &lt; pct ≤ 100
     * @return the nearest-rank percentile, NaN when there are no values
     */
    public static double nearestRank(double[] values, double pct) {
        if (!(pct > 0.0 && pct <= 100.0)) {
            throw new IllegalArgumentException("percentile must be in (0, 100], got " + pct);
        }
        double[] sorted = Arrays.stream(values).filter(v -> !Double.isNaN(v)).sorted().toArray();
        if (sorted.length == 0) {
            return Double.NaN;
        }
        int rank = (int) Math.ceil(pct / 100.0 * sorted.length - 1e-9);
        return sorted[Math.max(1, Math.min(rank, sorted.length)) - 1];
    }
}
