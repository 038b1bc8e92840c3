package org.loopstand.report.model;

import java.util.Objects;

/**
 * A histogram drawn as bars, e.g. command latency.
 *
 * @param title        chart title, e.g. {@code Command latency}
 * @param unit         unit of the bucket bounds, e.g. {@code ms}
 * @param upperBounds  each bucket's upper bound, ascending
 * @param counts       each bucket's count, same length
 */
public record Histogram(String title, String unit, double[] upperBounds, long[] counts) {
    public Histogram {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(unit, "unit");
        if (upperBounds.length != counts.length) {
            throw new IllegalArgumentException("histogram '" + title + "': " + upperBounds.length + " bounds but "
                    + counts.length + " counts");
        }
        upperBounds = upperBounds.clone();
        counts = counts.clone();
    }

    @Override
    public double[] upperBounds() {
        return upperBounds.clone();
    }

    @Override
    public long[] counts() {
        return counts.clone();
    }
}
