package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.function.Consumer;
import org.loopstand.controller.intake.IntakeObserver;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.time.Clock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Journals what the intake reports, on the agent thread while it drains: refused inputs
 * ({@code refused} with topic, reason and detail), the acks of this controller's own commands
 * (matched in {@link SentCommands}, their outcome fed back through {@link CommandOutcomes}; an ack
 * for a command it never sent changes nothing) and clock skew once per source and direction. Before
 * all that, every message routed as an {@code input} entry ({@link InputEntries}). Everything one
 * message causes is journaled at the one controller time read when it is routed, so that a replay
 * that sets its clock to that time writes the same entries.
 */
final class IntakeJournal implements IntakeObserver {
    private static final Logger LOG = LoggerFactory.getLogger(IntakeJournal.class);

    private final Clock clock;
    private final JournalWriter journal;
    private final SentCommands sentCommands;
    private final CommandOutcomes outcomes;
    private final Consumer<String> rejectedTopic;
    private final Consumer<String> routedTopic;
    /** controller time when the message now being routed was taken from the queue, epoch ms */
    private long routedAtMs;

    /**
     * @param journal       run journal, or null for none
     * @param rejectedTopic told the topic of every refused input (for the input-use counters)
     * @param routedTopic   told the topic of every input routed (for the input-use counters)
     */
    IntakeJournal(Clock clock, JournalWriter journal, SentCommands sentCommands, CommandOutcomes outcomes,
                  Consumer<String> rejectedTopic, Consumer<String> routedTopic) {
        this.clock = clock;
        this.journal = journal;
        this.sentCommands = sentCommands;
        this.outcomes = outcomes;
        this.rejectedTopic = rejectedTopic;
        this.routedTopic = routedTopic;
    }

    @Override
    public void onInput(String topic, byte[] payload, long receivedAtMs) {
        routedAtMs = clock.epochMillis();
        routedTopic.accept(topic);
        if (journal != null) {
            journal.append(routedAtMs, InputEntries.KIND, InputEntries.fields(topic, payload, receivedAtMs));
        }
    }

    @Override
    public void onRejected(String topic, String reason, String detail) {
        rejectedTopic.accept(topic);
        if (journal != null) {
            journal.append(routedAtMs, JournalFormat.KIND_REFUSED,
                    Map.of("topic", topic, "reason", reason, "detail", detail));
        }
    }

    @Override
    public void onAck(CommandAck ack, long receivedAtMs) {
        PlannedCommand answered = sentCommands.match(ack, receivedAtMs);
        if (answered == null) {
            return; // an ack for a command this controller never sent changes nothing here
        }
        outcomes.onAck(answered, ack);
        if (journal != null) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("ack", ack.unit());
            f.put("commandSeq", ack.commandSeq());
            f.put("outcome", ack.outcome() == AckOutcome.ACCEPTED ? "accepted" : "rejected");
            if (ack.reason() != null) {
                f.put("reason", ack.reason().name());
            }
            journal.append(receivedAtMs, ack.outcome() == AckOutcome.ACCEPTED ? JournalFormat.KIND_RECEIVED
                    : JournalFormat.KIND_REFUSED, f);
        }
    }

    @Override
    public void onClockSkew(String source, long skewMs) {
        LOG.warn("clock skew of {} ms from {}", skewMs, source);
        if (journal != null) {
            journal.append(routedAtMs, JournalFormat.KIND_EVENT,
                    Map.of("event", "clockSkew", "source", source, "skewMs", skewMs));
        }
    }
}
