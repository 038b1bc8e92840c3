package org.loopstand.controller.intake;

/**
 * Follows one publisher's sequence numbers. The same number again is a duplicate (not used); a
 * lower number than the highest seen is out of order (not used); a step forward of up to
 * {@value #MAX_GAP} is a gap (the sample is used, the missing count is recorded).
 *
 * <p>No single message can blind a source:
 * <ul>
 * <li>A <b>jump</b> (forward by more than {@value #MAX_GAP}) is accepted once and counted apart,
 * never as missing messages. The next number decides what it was: one that continues after the jump
 * confirms it (a publisher restarted with a higher start, as the rig's publishers do: they number
 * from their start time in epoch ms); one that continues the series from before the jump
 * <em>revokes</em> it (one bad message, counted as such) and tracking goes on from there.</li>
 * <li>A <b>restart</b> to a lower number: after {@value #RESTART_RUN} messages in a row that are
 * more than {@value #MAX_GAP} behind the highest and in order among themselves, the tracker follows
 * them (counted as a restart); the first {@value #RESTART_RUN} − 1 of them are dropped as out of
 * order. Messages less far behind are late deliveries: always out of order.</li>
 * </ul>
 * Not thread-safe.
 */
public final class SeqTracker {
    /** What one sequence number was. */
    public enum Outcome { FIRST, IN_ORDER, GAP, DUPLICATE, OUT_OF_ORDER, JUMP, RESTART }

    /** Largest forward step counted as a gap (missing messages), more is a jump. */
    public static final long MAX_GAP = 1_000;
    /** Messages in a row behind the highest, in order among themselves, that make a restart. */
    public static final int RESTART_RUN = 3;

    private long highest = -1;
    /** highest before an unconfirmed jump, −1 when none is pending */
    private long beforeJump = -1;
    private long behindLast = -1;
    private int behindRun;
    private long gaps;
    private long missing;
    private long duplicates;
    private long outOfOrder;
    private long jumps;
    private long revokedJumps;
    private long restarts;
    private long taken;

    public Outcome accept(long seq) {
        Outcome o = judge(seq);
        if (o != Outcome.DUPLICATE && o != Outcome.OUT_OF_ORDER) {
            taken++;
        }
        return o;
    }

    private Outcome judge(long seq) {
        if (highest < 0) {
            highest = seq;
            return Outcome.FIRST;
        }
        if (beforeJump >= 0) {
            long pendingFrom = beforeJump;
            beforeJump = -1;
            if (seq > pendingFrom && seq < highest && seq - pendingFrom <= MAX_GAP) {
                revokedJumps++; // the jump was one bad message: go on from the series before it
                highest = pendingFrom;
                return forward(seq);
            }
        }
        if (seq == highest) {
            duplicates++;
            behindRun = 0;
            return Outcome.DUPLICATE;
        }
        if (seq < highest - MAX_GAP) {
            behindRun = behindRun > 0 && seq > behindLast ? behindRun + 1 : 1;
            behindLast = seq;
            if (behindRun >= RESTART_RUN) {
                restarts++;
                behindRun = 0;
                highest = seq;
                return Outcome.RESTART;
            }
            outOfOrder++;
            return Outcome.OUT_OF_ORDER;
        }
        if (seq < highest) {
            behindRun = 0; // close behind: late delivery, not a restart
            outOfOrder++;
            return Outcome.OUT_OF_ORDER;
        }
        if (seq - highest > MAX_GAP) {
            jumps++;
            behindRun = 0;
            beforeJump = highest;
            highest = seq;
            return Outcome.JUMP;
        }
        return forward(seq);
    }

    private Outcome forward(long seq) {
        behindRun = 0;
        long step = seq - highest;
        highest = seq;
        if (step > 1) {
            gaps++;
            missing += step - 1;
            return Outcome.GAP;
        }
        return Outcome.IN_ORDER;
    }

    /** Forgets the series (the next number is a first). */
    public void reset() {
        highest = -1;
        beforeJump = -1;
        behindRun = 0;
    }

    public long highestSeq() { return highest; }
    /** @return messages taken in sequence (first, in order, after a gap, a jump or a restart) */
    public long takenCount() { return taken; }
    public long gapCount() { return gaps; }
    public long missingCount() { return missing; }
    public long duplicateCount() { return duplicates; }
    public long outOfOrderCount() { return outOfOrder; }
    /** @return forward jumps beyond {@value #MAX_GAP} accepted (confirmed or revoked later) */
    public long jumpCount() { return jumps; }
    /** @return jumps that the next number showed to be one bad message */
    public long revokedJumpCount() { return revokedJumps; }
    /** @return restarts to a lower number followed */
    public long restartCount() { return restarts; }
}
