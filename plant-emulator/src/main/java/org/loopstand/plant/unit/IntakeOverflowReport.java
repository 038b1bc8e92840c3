package org.loopstand.plant.unit;

/**
 * Journals commands lost before they reached a unit's plant interface (its intake queue was full, so
 * no ack is possible), at most once per second of clock time so a flood does not flood the journal.
 */
final class IntakeOverflowReport {
    private static final long MIN_INTERVAL_NANOS = 1_000_000_000L;

    private final String unitId;
    private final PlantJournal journal;
    private long lastReportNanos = Long.MIN_VALUE;

    IntakeOverflowReport(String unitId, PlantJournal journal) {
        this.unitId = unitId;
        this.journal = journal;
    }

    /**
     * @param totalLost commands lost since start
     * @param nowNanos  monotonic clock, ns
     * @param nowMs     the same instant, epoch ms (journal time)
     */
    void report(long totalLost, long nowNanos, long nowMs) {
        if (lastReportNanos == Long.MIN_VALUE || nowNanos - lastReportNanos >= MIN_INTERVAL_NANOS) {
            lastReportNanos = nowNanos;
            journal.event(nowMs, unitId, "overflow", "command intake full: " + totalLost + " commands dropped since start");
        }
    }
}
