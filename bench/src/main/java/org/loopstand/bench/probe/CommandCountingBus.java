package org.loopstand.bench.probe;

import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.atomic.LongAdder;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;

/**
 * The controller's bus with probes: counts commands published, PUBACKed or failed (by reason), acks, unit
 * telemetry and area meter messages received.
 */
public final class CommandCountingBus extends ForwardingBus {
    private final StampingBus.CommandTally tally;

    public CommandCountingBus(MessageBus inner, StampingBus.CommandTally tally) {
        super(inner);
        this.tally = tally;
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage m) {
        CompletableFuture<Void> f = inner.publish(m);
        if (m.topic().endsWith("/command")) {
            tally.commandsPublished.increment();
            f.whenComplete((v, e) -> {
                if (e == null) {
                    tally.commandsPubacked.increment();
                } else {
                    tally.commandsFailed.increment();
                    Throwable c = e instanceof CompletionException && e.getCause() != null ? e.getCause() : e;
                    String reason = c instanceof BusException be ? be.reason().name() : c.getClass().getSimpleName();
                    tally.failedByReason.computeIfAbsent(reason, k -> new LongAdder()).increment();
                }
            });
        }
        return f;
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        if (topicFilter.endsWith("/ack")) {
            inner.subscribe(topicFilter, qos, msg -> {
                tally.acksReceived.increment();
                listener.onMessage(msg);
            });
        } else {
            inner.subscribe(topicFilter, qos, msg -> {
                if (msg.topic().endsWith("/telemetry")) {
                    tally.telemetryReceived.increment();
                } else if (msg.topic().contains("/meter/")) {
                    tally.metersReceived.increment();
                }
                listener.onMessage(msg);
            });
        }
    }

}
