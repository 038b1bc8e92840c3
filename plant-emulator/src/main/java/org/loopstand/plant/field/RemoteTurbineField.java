package org.loopstand.plant.field;

import java.util.concurrent.atomic.AtomicLong;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The turbine field of a plant interface running in another process than the physics: readings come in
 * on {@code field/unit/{unit}/reading}, the load reference goes out on {@code field/unit/{unit}/reference}
 * (QoS 1, sent on change and repeated every {@value #RESEND_MS} ms so a restarted broker or physics
 * gets it again). Not ready until the first reading has come.
 */
public final class RemoteTurbineField implements TurbineField {
    public static final long RESEND_MS = 1_000;

    private final String unitId;
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final Clock clock;
    private final AtomicLong seq;
    private volatile FieldReading latest;
    private double writtenMw = Double.NaN;
    private long lastSentNanos;

    public RemoteTurbineField(String unitId, MessageBus bus, TopicTree topics, MessageCodec codec, Clock clock) {
        this.unitId = unitId;
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.clock = clock;
        this.seq = new AtomicLong(clock.epochMillis());
    }

    /** Subscribes to the unit's readings. */
    public RemoteTurbineField start() {
        bus.subscribe(topics.fieldReading(unitId), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), FieldReading.class).message()
                        .filter(r -> r.unit().equals(unitId)).ifPresent(r -> latest = r));
        return this;
    }

    @Override
    public boolean ready() {
        return latest != null;
    }

    @Override
    public double outputMw() {
        FieldReading r = latest;
        return r == null ? 0.0 : r.outputMw();
    }

    @Override
    public double loadReferenceMw() {
        FieldReading r = latest;
        return r == null ? Double.NaN : r.loadReferenceMw();
    }

    /** @return the source time of the latest reading (the physics' time when it was read), 0 before the first */
    @Override
    public long readingTimeMs() {
        FieldReading r = latest;
        return r == null ? 0 : r.sourceTime();
    }

    @Override
    public UnitStatus status() {
        FieldReading r = latest;
        return r == null ? UnitStatus.OFFLINE : r.status();
    }

    @Override
    public void writeLoadReferenceMw(double mw) {
        writtenMw = mw;
        send();
    }

    /** Owner thread: repeats the last reference when {@value #RESEND_MS} ms have passed. */
    public void resendIfDue() {
        if (!Double.isNaN(writtenMw) && clock.monotonicNanos() - lastSentNanos >= RESEND_MS * 1_000_000L) {
            send();
        }
    }

    private void send() {
        lastSentNanos = clock.monotonicNanos();
        if (!bus.isConnected()) {
            return; // the repeat will carry it once the link is back
        }
        byte[] payload = codec.encode(new FieldReference(seq.getAndIncrement(), clock.epochMillis(), unitId, writtenMw, true));
        bus.publish(OutboundMessage.of(topics.fieldReference(unitId), payload, Qos.AT_LEAST_ONCE));
    }
}
