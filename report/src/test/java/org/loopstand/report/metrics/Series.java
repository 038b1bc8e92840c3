package org.loopstand.report.metrics;

import org.loopstand.report.model.TimeSeries;

/** Test helper: builds series from (seconds, value) pairs relative to a clock-minute aligned start. */
final class Series {
    /** 2023-11-14T22:13:00Z, the start of a clock minute (1,699,999,980,000 = 28,333,333 × 60,000). */
    static final long T0_MS = 1_699_999_980_000L;
    /** 2023-11-14T22:15:00Z: a whole quarter hour (1,700,000,100,000 / 900,000 = 1,888,889 exactly). */
    static final long Q0_MS = 1_700_000_100_000L;

    private Series() {
    }

    static TimeSeries of(String unit, long startMs, double... secondsAndValues) {
        int n = secondsAndValues.length / 2;
        long[] t = new long[n];
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = startMs + Math.round(secondsAndValues[2 * i] * 1000.0);
            v[i] = secondsAndValues[2 * i + 1];
        }
        return new TimeSeries("test", unit, t, v);
    }

    /** A constant value at the start of each of {@code minutes} clock minutes. */
    static TimeSeries perMinute(String unit, double... values) {
        long[] t = new long[values.length];
        for (int i = 0; i < values.length; i++) {
            t[i] = T0_MS + i * 60_000L;
        }
        return new TimeSeries("test", unit, t, values);
    }
}
