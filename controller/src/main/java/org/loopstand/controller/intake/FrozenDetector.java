package org.loopstand.controller.intake;

/**
 * Flags a value that stops changing although its noise should move it: {@code identicalCount}
 * consecutive samples within {@code epsilon} of each other while their source time advances.
 * Samples with the same source time are repeats, not evidence, and are ignored here.
 */
public final class FrozenDetector {
    private final int identicalCount;
    private final double epsilon;
    private double lastValue = Double.NaN;
    private long lastSourceTimeMs = Long.MIN_VALUE;
    private int run;

    /**
     * @param identicalCount samples in a row that make a value frozen, ≥ 2; 0 = detection off
     * @param epsilon        largest difference still counted as identical, ≥ 0 (input unit)
     */
    public FrozenDetector(int identicalCount, double epsilon) {
        if (identicalCount != 0 && identicalCount < 2) {
            throw new IllegalArgumentException("frozen identicalCount must be 0 (off) or >= 2, was " + identicalCount);
        }
        if (!(epsilon >= 0)) {
            throw new IllegalArgumentException("frozen epsilon must be >= 0, was " + epsilon);
        }
        this.identicalCount = identicalCount;
        this.epsilon = epsilon;
    }

    /** @return true when the value is frozen after this sample */
    public boolean accept(double value, long sourceTimeMs) {
        if (identicalCount == 0) {
            return false;
        }
        if (sourceTimeMs <= lastSourceTimeMs) {
            return frozen();
        }
        if (!Double.isNaN(lastValue) && Math.abs(value - lastValue) <= epsilon) {
            run++;
        } else {
            run = 1;
        }
        lastValue = value;
        lastSourceTimeMs = sourceTimeMs;
        return frozen();
    }

    /** @return samples in the present run of identical values (1 after a change, 0 before any sample) */
    public int identicalRun() {
        return run;
    }

    public boolean frozen() {
        return identicalCount > 0 && run >= identicalCount;
    }
}
