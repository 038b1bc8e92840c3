package org.loopstand.controller.intake;

/**
 * Follows one publisher's sequence numbers. A lower number than the highest seen is out of order
 * (not used); the same number again is a duplicate (not used); a jump is a gap (the sample is
 * used, the missing count is recorded). A publisher restart (seq back to 0 or 1 after a higher
 * number) is reported as out of order until {@link #reset()}; the intake decides when to reset.
 */
public final class SeqTracker {
    /** What one sequence number was. */
    public enum Outcome { FIRST, IN_ORDER, GAP, DUPLICATE, OUT_OF_ORDER }

    private long highest = -1;
    private long gaps;
    private long missing;
    private long duplicates;
    private long outOfOrder;

    public Outcome accept(long seq) {
        if (highest < 0) {
            highest = seq;
            return Outcome.FIRST;
        }
        if (seq == highest) {
            duplicates++;
            return Outcome.DUPLICATE;
        }
        if (seq < highest) {
            outOfOrder++;
            return Outcome.OUT_OF_ORDER;
        }
        long jump = seq - highest;
        highest = seq;
        if (jump > 1) {
            gaps++;
            missing += jump - 1;
            return Outcome.GAP;
        }
        return Outcome.IN_ORDER;
    }

    public void reset() {
        highest = -1;
    }

    public long highestSeq() { return highest; }
    public long gapCount() { return gaps; }
    public long missingCount() { return missing; }
    public long duplicateCount() { return duplicates; }
    public long outOfOrderCount() { return outOfOrder; }
}
