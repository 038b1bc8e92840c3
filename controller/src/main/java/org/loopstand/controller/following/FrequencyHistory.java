package org.loopstand.controller.following;

import java.util.ArrayDeque;
import java.util.Deque;

/**
 * Frequency deviations of one area over a sliding window, for the governor allowance of the
 * following check: a turbine's primary response lags the frequency (a reheat stage by seconds, a
 * hydro unit with transient droop by a minute or more), so at any moment its governor share lies
 * somewhere between the steady-state shares of the deviations seen over the last window. Bounded
 * in count. Not thread-safe.
 */
public final class FrequencyHistory {
    private static final int MAX_SAMPLES = 4096;
    private final long windowMs;
    private final Deque<double[]> samples = new ArrayDeque<>(); // {tMs, dfHz}

    /** @param windowMs how long a turbine's primary response takes to settle, ms, ≥ 0 */
    public FrequencyHistory(long windowMs) {
        if (windowMs < 0) {
            throw new IllegalArgumentException("windowMs must be >= 0, was " + windowMs);
        }
        this.windowMs = windowMs;
    }

    /** Adds the deviation f − Fs measured at {@code tMs}, Hz. */
    public void add(long tMs, double dfHz) {
        samples.addLast(new double[] {tMs, dfHz});
        while (samples.size() > MAX_SAMPLES || (samples.size() > 1 && samples.peekFirst()[0] < tMs - windowMs)) {
            samples.removeFirst();
        }
    }

    /** @return {min, max} deviation over the window ending at the latest sample, Hz; {0, 0} when empty */
    public double[] range() {
        if (samples.isEmpty()) {
            return new double[] {0, 0};
        }
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] s : samples) {
            lo = Math.min(lo, s[1]);
            hi = Math.max(hi, s[1]);
        }
        return new double[] {lo, hi};
    }
}
