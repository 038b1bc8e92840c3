package org.loopstand.plant.unit;

import java.util.EnumMap;
import java.util.Map;
import java.util.concurrent.atomic.AtomicLongArray;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

/**
 * How one unit's plant interface answers each command: an ack (acks count their own seq, so the
 * controller can reckon loss per message kind), a journal line with the load reference target before
 * and after, and counts of accepted commands and of refusals per reason code. The answer methods are
 * for the owner thread; the counts may be read from any thread.
 */
final class CommandAnswers {
    private static final int MAX_DETAIL_CHARS = 1024;

    private final String unitId;
    private final UnitOutput output;
    private final PlantJournal journal;
    private final AtomicLongArray refusals = new AtomicLongArray(RefusalReason.values().length);
    private long ackSeq;
    private long lastAcceptedSeq;
    private volatile long accepted;

    /** @param seqStart seq of the first ack */
    CommandAnswers(String unitId, UnitOutput output, PlantJournal journal, long seqStart) {
        this.unitId = unitId;
        this.output = output;
        this.journal = journal;
        this.ackSeq = seqStart;
    }

    /**
     * Acks and journals an accepted command.
     *
     * @param detail         what was not done as asked (e.g. at a limit), or null
     * @param targetBeforeMw load reference target before the command, MW
     * @param targetAfterMw  load reference target after it, MW
     */
    void accepted(long nowMs, UnitCommand c, String detail, double targetBeforeMw, double targetAfterMw) {
        lastAcceptedSeq = c.seq();
        accepted++;
        journal.command(nowMs, CommandFate.of(unitId, c, c.seq(), c.controllerId(), "accepted", null, detail,
                targetBeforeMw, targetAfterMw));
        output.ack(new CommandAck(ackSeq++, nowMs, unitId, c.seq(), c.controllerId(), AckOutcome.ACCEPTED, null, detail));
    }

    /**
     * Counts, journals and acks a refused command.
     *
     * @param c        the command, or null when it did not decode
     * @param targetMw load reference target, unchanged, MW (NaN before the first field reading)
     */
    void refused(long nowMs, UnitCommand c, long commandSeq, String controllerId, Refusal r, double targetMw) {
        refusals.incrementAndGet(r.reason().ordinal());
        journal.refused(nowMs, unitId, r.reason(), commandSeq, r.detail());
        journal.command(nowMs, CommandFate.of(unitId, c, commandSeq, controllerId, "rejected", r.reason().wireName(),
                r.detail(), targetMw, targetMw));
        output.ack(new CommandAck(ackSeq++, nowMs, unitId, Math.max(0, commandSeq), controllerId,
                AckOutcome.REJECTED, r.reason(), truncate(r.detail())));
    }

    private static String truncate(String s) {
        return s == null || s.length() <= MAX_DETAIL_CHARS ? s : s.substring(0, MAX_DETAIL_CHARS - 3) + "...";
    }

    /** @return seq of the last accepted command, 0 before the first (owner thread) */
    long lastAcceptedSeq() {
        return lastAcceptedSeq;
    }

    long acceptedCount() {
        return accepted;
    }

    long refusalCount(RefusalReason reason) {
        return refusals.get(reason.ordinal());
    }

    /** @return refusals so far per reason code, only codes with at least one */
    Map<RefusalReason, Long> refusalCounts() {
        Map<RefusalReason, Long> m = new EnumMap<>(RefusalReason.class);
        for (RefusalReason r : RefusalReason.values()) {
            if (refusals.get(r.ordinal()) > 0) {
                m.put(r, refusals.get(r.ordinal()));
            }
        }
        return m;
    }
}
