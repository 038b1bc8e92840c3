package org.loopstand.controller.runtime;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.Queue;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Turns a planned command into a {@link UnitCommand} on the bus: numbered, signed when a signer is
 * set, QoS 1 with the MQTT message expiry taken from validUntil, remembered in {@link SentCommands}
 * and journaled ({@code sent}). A command that cannot be signed is not sent and goes back to the
 * cycle as not executed ({@code unsignable}); a publish that fails does too ({@code publishFailed},
 * via {@link CommandOutcomes}). Agent thread only, except the publish completions.
 */
final class CommandSender {
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final String controllerId;
    private final long epoch;
    private final SentCommands sentCommands;
    private final CommandOutcomes outcomes;
    private final JournalWriter journal;
    private final ControllerMetrics metrics;
    private final Queue<String> publishFailures;
    private CommandSigner signer;
    private long commandSeq;
    private long commandsSent;
    private long unsignable;

    CommandSender(MessageBus bus, TopicTree topics, MessageCodec codec, String controllerId, long epoch,
                  SentCommands sentCommands, CommandOutcomes outcomes, JournalWriter journal, ControllerMetrics metrics,
                  Queue<String> publishFailures) {
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.controllerId = controllerId;
        this.epoch = epoch;
        this.sentCommands = sentCommands;
        this.outcomes = outcomes;
        this.journal = journal;
        this.metrics = metrics;
        this.publishFailures = publishFailures;
    }

    void signWith(CommandSigner commandSigner) {
        this.signer = commandSigner;
    }

    void send(PlannedCommand c, long nowMs) {
        long seq = ++commandSeq;
        UnitCommand cmd = c.kind() == CommandKind.PULSE
                ? UnitCommand.pulse(seq, nowMs, c.unitId(), controllerId, epoch, c.validUntilMs(),
                        c.direction(), c.durationMs())
                : UnitCommand.setpoint(seq, nowMs, c.unitId(), controllerId, epoch, c.validUntilMs(), c.setpointMw());
        if (signer != null) {
            try {
                cmd = signer.sign(cmd);
            } catch (IllegalStateException e) {
                // no key for the unit: an unsigned command would only be refused, so none is sent
                unsignable++;
                publishFailures.add("command " + seq + " to " + c.unitId() + " not signed: " + e.getMessage());
                outcomes.unsignable(c);
                return;
            }
        }
        long expiryS = Math.max(1, (c.validUntilMs() - nowMs + 999) / 1000);
        OutboundMessage m = new OutboundMessage(topics.unitCommand(c.unitId()), codec.encode(cmd), Qos.AT_LEAST_ONCE,
                false, expiryS);
        sentCommands.sent(seq, c);
        bus.publish(m).whenComplete((v, e) -> {
            if (e != null) {
                publishFailures.add("command " + seq + " to " + c.unitId() + ": " + e);
                outcomes.publishFailed(seq);
            }
        });
        commandsSent++;
        metrics.commandSent(c.kind().name().toLowerCase(Locale.ROOT));
        if (journal != null) {
            journal.append(nowMs, JournalFormat.KIND_SENT, fields(c, seq));
        }
    }

    private static Map<String, Object> fields(PlannedCommand c, long seq) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("unit", c.unitId());
        f.put("seq", seq);
        f.put("commandKind", c.kind().name().toLowerCase(Locale.ROOT));
        if (c.kind() == CommandKind.PULSE) {
            f.put("direction", c.direction().name().toLowerCase(Locale.ROOT));
            f.put("durationMs", c.durationMs());
        } else {
            f.put("setpointMw", c.setpointMw());
        }
        f.put("deltaMw", c.deltaMw());
        f.put("validUntil", c.validUntilMs());
        return f;
    }

    long commandsSent() {
        return commandsSent;
    }

    long unsignable() {
        return unsignable;
    }
}
