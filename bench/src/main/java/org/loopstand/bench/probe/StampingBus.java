package org.loopstand.bench.probe;

import java.util.concurrent.CompletableFuture;
import java.util.concurrent.atomic.LongAdder;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.time.Clock;

/**
 * A plant connection with probes: stamps telemetry and meter publishes into {@link PublishStamps},
 * counts acks published and commands received. Otherwise passes everything through. Without stamps
 * (the controller in another process) the publishes are only counted.
 */
public final class StampingBus extends ForwardingBus {
    private final PublishStamps stamps;
    private final Clock clock;
    private final CommandTally tally;

    public StampingBus(MessageBus inner, PublishStamps stamps, Clock clock, CommandTally tally) {
        super(inner);
        this.stamps = stamps;
        this.clock = clock;
        this.tally = tally;
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage m) {
        String t = m.topic();
        if (t.endsWith("/telemetry") || t.contains("/meter/")) {
            tally.measuredPublished.increment();
            if (stamps != null) {
                stamps.stamp(t, m.payload(), clock.monotonicNanos());
            }
        } else if (t.endsWith("/ack")) {
            tally.acksPublished.increment();
        } else if (t.contains("/field/")) {
            tally.fieldPublished.increment();
        }
        return inner.publish(m);
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        if (topicFilter.endsWith("/command")) {
            inner.subscribe(topicFilter, qos, msg -> {
                tally.commandsArrived.increment();
                listener.onMessage(msg);
            });
        } else {
            inner.subscribe(topicFilter, qos, listener);
        }
    }


    /** Counts along the command path, from both ends. */
    public static final class CommandTally {
        public final LongAdder measuredPublished = new LongAdder();
        public final LongAdder commandsPublished = new LongAdder();
        public final LongAdder commandsPubacked = new LongAdder();
        public final LongAdder commandsFailed = new LongAdder();
        public final LongAdder commandsArrived = new LongAdder();
        public final LongAdder acksPublished = new LongAdder();
        public final LongAdder acksReceived = new LongAdder();
        /** field readings (plant) or references (unit hosts) published, layout hosts */
        public final LongAdder fieldPublished = new LongAdder();
        /** unit telemetry and area meter messages the controller's bus delivered */
        public final LongAdder telemetryReceived = new LongAdder();
        public final LongAdder metersReceived = new LongAdder();
        public final java.util.Map<String, LongAdder> failedByReason = new java.util.concurrent.ConcurrentHashMap<>();
    }
}
