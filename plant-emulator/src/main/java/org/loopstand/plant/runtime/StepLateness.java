package org.loopstand.plant.runtime;

import java.util.function.Consumer;

import org.HdrHistogram.Histogram;

/**
 * How late each physics step runs against the clock, in µs of scenario time. When a step runs later
 * than the warning threshold, says so once (with how far behind); the loop catches up as fast as it
 * can, and a pace keeper watching the steps ({@link #watchSteps}) may slow the clock.
 */
public final class StepLateness {
    private static final long MAX_US = 3_600_000_000L;
    private final Histogram lateUs = new Histogram(MAX_US, 3);
    private final long warnNanos;
    private final Consumer<String> warnings;
    private boolean warned;
    private volatile long currentNanos;
    private java.util.function.LongConsumer stepWatcher;

    /**
     * @param warnNanos lateness that triggers the one warning, ns of scenario time
     * @param warnings  where the warning goes (stdout in the CLI)
     */
    public StepLateness(long warnNanos, Consumer<String> warnings) {
        this.warnNanos = warnNanos;
        this.warnings = warnings;
    }

    public synchronized void record(long lateNanos) {
        long late = Math.max(0, lateNanos);
        currentNanos = late;
        lateUs.recordValue(Math.min(MAX_US, late / 1_000));
        if (stepWatcher != null) {
            stepWatcher.accept(late);
        }
        if (!warned && late > warnNanos) {
            warned = true;
            warnings.accept(String.format(java.util.Locale.ROOT,
                    "plant: physics is falling behind the clock by %.3f s (steps run late)", late / 1e9));
        }
    }

    /**
     * Before the loop starts: {@code watcher} gets every step's lateness, ns of scenario time, on the
     * loop's thread (the pace keeper, {@link PlantPacing}); it must be cheap.
     */
    public synchronized void watchSteps(java.util.function.LongConsumer watcher) {
        this.stepWatcher = watcher;
    }

    /** @return a copy of the lateness histogram, µs */
    public synchronized Histogram histogramUs() {
        return lateUs.copy();
    }

    /** @return lateness of the latest step, ns */
    public long currentNanos() {
        return currentNanos;
    }

    public synchronized boolean warned() {
        return warned;
    }
}
