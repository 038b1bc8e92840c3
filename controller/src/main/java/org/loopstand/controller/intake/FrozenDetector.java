package org.loopstand.controller.intake;

/**
 * Flags a value that stops changing although its noise should move it, judged in scenario time:
 * the samples have stayed within {@code epsilon} of the first sample of their run for at least
 * {@code frozenAfterMs} of source time (the source's own time stamps, so the judgement does not
 * depend on the replay rate), with at least {@code minReadings} samples in the run. A scan that
 * was lost inside the run does not delay the verdict: it comes with the first sample whose source
 * time is {@code frozenAfterMs} or more after the run began (only a lost scan at that very edge
 * delays it, by one scan period). {@code minReadings} keeps two equal readings far apart from
 * counting as a freeze. Samples with the same or an older source time are repeats, not evidence.
 */
public final class FrozenDetector {
    private final long frozenAfterMs;
    private final int minReadings;
    private final double epsilon;
    private double runValue = Double.NaN;
    private long runStartMs;
    private long lastSourceTimeMs = Long.MIN_VALUE;
    private int run;

    /**
     * @param frozenAfterMs source-time span of identical samples that makes a value frozen, ms
     *                      (scenario time), &gt; 0; 0 = detection off
     * @param minReadings   fewest samples in that span, ≥ 2
     * @param epsilon       largest difference from the run's first sample still counted as
     *                      identical, ≥ 0 (input unit)
     */
    public FrozenDetector(long frozenAfterMs, int minReadings, double epsilon) {
        if (frozenAfterMs < 0) {
            throw new IllegalArgumentException("frozenAfterMs must be 0 (off) or > 0, was " + frozenAfterMs);
        }
        if (frozenAfterMs > 0 && minReadings < 2) {
            throw new IllegalArgumentException("frozenMinReadings must be >= 2, was " + minReadings);
        }
        if (!(epsilon >= 0)) {
            throw new IllegalArgumentException("frozen epsilon must be >= 0, was " + epsilon);
        }
        this.frozenAfterMs = frozenAfterMs;
        this.minReadings = minReadings;
        this.epsilon = epsilon;
    }

    /** @return true when the value is frozen after this sample */
    public boolean accept(double value, long sourceTimeMs) {
        if (frozenAfterMs == 0) {
            return false;
        }
        if (sourceTimeMs <= lastSourceTimeMs) {
            return frozen();
        }
        if (!Double.isNaN(runValue) && Math.abs(value - runValue) <= epsilon) {
            run++;
        } else {
            run = 1;
            runValue = value;
            runStartMs = sourceTimeMs;
        }
        lastSourceTimeMs = sourceTimeMs;
        return frozen();
    }

    /** @return samples in the present run of identical values (1 after a change, 0 before any sample) */
    public int identicalRun() {
        return run;
    }

    /** @return source-time span of the present run of identical values, ms (0 before any sample) */
    public long identicalSpanMs() {
        return run == 0 ? 0 : lastSourceTimeMs - runStartMs;
    }

    public boolean frozen() {
        return frozenAfterMs > 0 && run >= minReadings && identicalSpanMs() >= frozenAfterMs;
    }
}
