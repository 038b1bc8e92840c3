package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.Map;

import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.message.CommandAck;

/**
 * The commands this controller sent that await their ack, the one record of them: an ack is counted
 * as received only when it answers one of them (same controller id, a seq this controller sent to
 * that unit, not answered before), and the answered command goes on to {@link CommandOutcomes}.
 * Every other ack (another controller's, a forged one, a second ack for the same command) is an
 * unknown ack, counted apart. Memory is bounded: past {@value #MAX_AWAITED} unanswered commands the
 * oldest is forgotten (its late ack then counts as unknown). Not thread-safe (the controller's cycle
 * thread).
 */
final class SentCommands {
    /** Most unanswered commands remembered. */
    static final int MAX_AWAITED = 65_536;

    private final String controllerId;
    private final JournalWriter journal;
    private final LinkedHashMap<Long, PlannedCommand> awaited = new LinkedHashMap<>(16, 0.75f, false) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<Long, PlannedCommand> eldest) {
            if (size() > MAX_AWAITED) {
                forgotten++;
                return true;
            }
            return false;
        }
    };
    private long matched;
    private long unknown;
    private long forgotten;

    /** @param journal where unknown acks are journaled ({@code received} with {@code unknownAck}), or null */
    SentCommands(String controllerId, JournalWriter journal) {
        this.controllerId = controllerId;
        this.journal = journal;
    }

    /** Notes a command sent with {@code seq}. */
    void sent(long seq, PlannedCommand command) {
        awaited.put(seq, command);
    }

    /** @return the command sent with {@code seq}, no longer awaited (its publish failed), or null */
    PlannedCommand forget(long seq) {
        return awaited.remove(seq);
    }

    /**
     * @return the command the ack answers, if it is one this controller sent and had not had answered;
     *         else null, and the unknown ack is counted and journaled
     */
    PlannedCommand match(CommandAck ack, long receivedAtMs) {
        PlannedCommand c = awaited.get(ack.commandSeq());
        if (ack.controllerId().equals(controllerId) && c != null && ack.unit().equals(c.unitId())) {
            awaited.remove(ack.commandSeq());
            matched++;
            return c;
        }
        unknown++;
        if (journal != null) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("unknownAck", ack.unit());
            f.put("controllerId", ack.controllerId());
            f.put("commandSeq", ack.commandSeq());
            journal.append(receivedAtMs, JournalFormat.KIND_RECEIVED, f);
        }
        return null;
    }

    long matchedCount() { return matched; }
    long unknownCount() { return unknown; }
    /** @return commands still awaiting their ack */
    int awaitedCount() { return awaited.size(); }
    /** @return unanswered commands forgotten to bound memory */
    long forgottenCount() { return forgotten; }
}
