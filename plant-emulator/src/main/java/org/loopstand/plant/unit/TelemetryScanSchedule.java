package org.loopstand.plant.unit;

/**
 * When a unit publishes telemetry: at a fixed rate of one scan per period; after a stall the missed
 * scans are skipped instead of sent as a burst. Times are on the owner's monotonic clock, ns.
 */
final class TelemetryScanSchedule {
    private final long periodNanos;
    private long nextNanos;

    /**
     * @param periodMs scan period, ms, ≥ 1
     * @param nowNanos the first scan is due at once
     */
    TelemetryScanSchedule(long periodMs, long nowNanos) {
        this.periodNanos = periodMs * 1_000_000L;
        this.nextNanos = nowNanos;
    }

    /**
     * Moves the first scan {@code phaseNanos} (modulo the period) after {@code fromNanos}.
     *
     * @param phaseNanos ≥ 0, ns
     */
    void stagger(long fromNanos, long phaseNanos) {
        if (phaseNanos < 0) {
            throw new IllegalArgumentException("phaseNanos must be ≥ 0, got " + phaseNanos);
        }
        nextNanos = fromNanos + phaseNanos % periodNanos;
    }

    /** @return true when a scan is due at {@code nowNanos}; the next one is then scheduled */
    boolean takeDue(long nowNanos) {
        if (nowNanos < nextNanos) {
            return false;
        }
        long missed = (nowNanos - nextNanos) / periodNanos;
        nextNanos += (missed + 1) * periodNanos;
        return true;
    }
}
