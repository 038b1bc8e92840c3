package org.loopstand.controller.following;

import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Iterator;
import java.util.OptionalDouble;

/**
 * Frequency deviations of one area over a sliding window, keyed by the meter's source time, for the
 * governor allowance of the following check: a turbine's primary response lags the frequency (a
 * reheat stage by seconds, a hydro unit with transient droop by a minute or more), so at any moment
 * its governor share lies somewhere between the steady-state shares of the deviations seen over the
 * last window. Keyed by source time so that a unit's output can be paired with the frequency of the
 * same instant ({@link #dfAt}), not with whatever reading the cycle happens to hold. Bounded in
 * count. Not thread-safe.
 */
public final class FrequencyHistory {
    private static final int MAX_SAMPLES = 4096;
    private final long windowMs;
    private final Deque<double[]> samples = new ArrayDeque<>(); // {sourceTimeMs, dfHz}

    /** @param windowMs how long a turbine's primary response takes to settle, ms, ≥ 0 */
    public FrequencyHistory(long windowMs) {
        if (windowMs < 0) {
            throw new IllegalArgumentException("windowMs must be >= 0, was " + windowMs);
        }
        this.windowMs = windowMs;
    }

    /**
     * Adds the deviation f − Fs measured at {@code tMs}, Hz. A sample not newer than the latest one
     * (the same reading held over another cycle) is ignored.
     */
    public void add(long tMs, double dfHz) {
        if (!samples.isEmpty() && tMs <= samples.peekLast()[0]) {
            return;
        }
        samples.addLast(new double[] {tMs, dfHz});
        // keep one sample older than the window so that dfAt can bracket its start
        while (samples.size() > MAX_SAMPLES || (samples.size() > 2 && second()[0] < tMs - windowMs)) {
            samples.removeFirst();
        }
    }

    private double[] second() {
        Iterator<double[]> it = samples.iterator();
        it.next();
        return it.next();
    }

    /** @return {min, max} deviation over the window ending at the latest sample, Hz; {0, 0} when empty */
    public double[] range() {
        if (samples.isEmpty()) {
            return new double[] {0, 0};
        }
        double from = samples.peekLast()[0] - windowMs;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] s : samples) {
            if (s[0] >= from || s == samples.peekLast()) {
                lo = Math.min(lo, s[1]);
                hi = Math.max(hi, s[1]);
            }
        }
        return new double[] {lo, hi};
    }

    /**
     * @return the deviation valid at {@code tMs}, Hz: that of the first reading not older than
     *         {@code tMs} (a reading taken at or after the instant, so one that predates a step is
     *         never paired with an output that already answered it); empty when no reading that
     *         recent has arrived yet
     */
    public OptionalDouble dfAt(long tMs) {
        for (double[] s : samples) {
            if (s[0] >= tMs) {
                return OptionalDouble.of(s[1]);
            }
        }
        return OptionalDouble.empty();
    }

    /** @return the latest deviation, Hz, or empty when there are no samples */
    public OptionalDouble latest() {
        return samples.isEmpty() ? OptionalDouble.empty() : OptionalDouble.of(samples.peekLast()[1]);
    }
}
