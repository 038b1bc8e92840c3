package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.Map;

import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.CommandAck;

/**
 * The commands this controller sent that await their ack, so that an ack is counted as received
 * only when it answers one of them: same controller id, a seq this controller sent to that unit,
 * and not answered before. Every other ack (another controller's, a forged one, a second ack for
 * the same command) is an unknown ack, counted apart. Memory is bounded: past
 * {@value #MAX_AWAITED} unanswered commands the oldest is forgotten (its late ack then counts as
 * unknown). Not thread-safe (the controller's cycle thread).
 */
final class SentCommands {
    /** Most unanswered commands remembered. */
    static final int MAX_AWAITED = 65_536;

    private final String controllerId;
    private final JournalWriter journal;
    private final LinkedHashMap<Long, String> awaited = new LinkedHashMap<>(16, 0.75f, false) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<Long, String> eldest) {
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

    /** Notes a command sent with {@code seq} to {@code unit}. */
    void sent(long seq, String unit) {
        awaited.put(seq, unit);
    }

    /**
     * @return whether the ack answers a command this controller sent and had not had answered; an
     *         unknown ack is counted and journaled
     */
    boolean match(CommandAck ack, long receivedAtMs) {
        if (ack.controllerId().equals(controllerId) && ack.unit().equals(awaited.get(ack.commandSeq()))) {
            awaited.remove(ack.commandSeq());
            matched++;
            return true;
        }
        unknown++;
        if (journal != null) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("unknownAck", ack.unit());
            f.put("controllerId", ack.controllerId());
            f.put("commandSeq", ack.commandSeq());
            journal.append(receivedAtMs, JournalFormat.KIND_RECEIVED, f);
        }
        return false;
    }

    long matchedCount() { return matched; }
    long unknownCount() { return unknown; }
    /** @return commands still awaiting their ack */
    int awaitedCount() { return awaited.size(); }
    /** @return unanswered commands forgotten to bound memory */
    long forgottenCount() { return forgotten; }
}
