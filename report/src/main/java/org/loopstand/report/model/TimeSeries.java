package org.loopstand.report.model;

import java.util.Arrays;
import java.util.Objects;

/**
 * A sampled quantity: times in scenario epoch ms (non-decreasing) and values in {@code unit}.
 * NaN marks a missing value (drawn as a gap, skipped by the metrics).
 *
 * @param name   what is measured, e.g. {@code frequency area-a}
 * @param unit   the values' unit, e.g. {@code Hz}, {@code MW}
 * @param tMs    sample times, epoch ms, non-decreasing
 * @param values sample values, same length as {@code tMs}
 */
public record TimeSeries(String name, String unit, long[] tMs, double[] values) {
    public TimeSeries {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(tMs, "tMs");
        Objects.requireNonNull(values, "values");
        if (tMs.length != values.length) {
            throw new IllegalArgumentException("series '" + name + "': " + tMs.length + " times but " + values.length + " values");
        }
        for (int i = 1; i < tMs.length; i++) {
            if (tMs[i] < tMs[i - 1]) {
                throw new IllegalArgumentException("series '" + name + "': time goes backwards at index " + i
                        + " (" + tMs[i - 1] + " then " + tMs[i] + " ms)");
            }
        }
        tMs = tMs.clone();
        values = values.clone();
    }

    /** @return number of samples */
    public int size() {
        return tMs.length;
    }

    /** @return sample time i, epoch ms */
    public long timeMs(int i) {
        return tMs[i];
    }

    /** @return sample value i */
    public double value(int i) {
        return values[i];
    }

    @Override
    public long[] tMs() {
        return tMs.clone();
    }

    @Override
    public double[] values() {
        return values.clone();
    }

    /**
     * Value in force at {@code atMs} under zero-order hold (the last sample at or before it).
     *
     * @return that value, NaN before the first sample
     */
    public double valueAt(long atMs) {
        int i = Arrays.binarySearch(tMs, atMs);
        if (i < 0) {
            i = -i - 2;
        } else {
            while (i + 1 < tMs.length && tMs[i + 1] == atMs) {
                i++;
            }
        }
        return i < 0 ? Double.NaN : values[i];
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof TimeSeries s && name.equals(s.name) && unit.equals(s.unit)
                && Arrays.equals(tMs, s.tMs) && Arrays.equals(values, s.values);
    }

    @Override
    public int hashCode() {
        return Objects.hash(name, unit, Arrays.hashCode(tMs), Arrays.hashCode(values));
    }

    @Override
    public String toString() {
        return "TimeSeries[" + name + " (" + unit + "), " + tMs.length + " samples]";
    }
}
