package org.loopstand.plant.field;

import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.UnitTopicRouter;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Physics side of the field topics for units whose plant interface runs in another process: applies
 * the latest load reference each one sent and publishes each unit's reading on a fixed period. When
 * a unit's interface goes away nothing arrives and the turbine simply keeps its last load reference,
 * its governor still acting, as on a real lost plant link. Readings fall due on the clock and carry the
 * time of the physics state they were read from ({@link PhysicsEpoch}), so the interface's telemetry
 * can pass that time on.
 */
public final class FieldGateway {
    /** Default reading period, ms of scenario time. */
    public static final long DEFAULT_PERIOD_MS = 200;

    private final GridSimulator sim;
    private final PhysicsEpoch physicsEpoch;
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final Clock clock;
    private final List<String> units;
    private long periodNanos;
    private final Map<String, FieldReference> pending = new ConcurrentHashMap<>();
    private long nextReadingNanos;
    private long seq;
    private long applied;
    private final UnitTopicRouter router;

    public FieldGateway(GridSimulator sim, PhysicsEpoch physicsEpoch, MessageBus bus, TopicTree topics, MessageCodec codec,
                        Clock clock, List<String> units, long periodMs) {
        this.sim = sim;
        this.physicsEpoch = physicsEpoch;
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.clock = clock;
        this.units = List.copyOf(units);
        this.periodNanos = periodMs * 1_000_000L;
        this.nextReadingNanos = clock.monotonicNanos();
        this.seq = clock.epochMillis();
        this.router = new UnitTopicRouter(topics.site());
    }

    /**
     * Subscribes the field references: one wildcard filter for the site, routed to each unit by its topic
     * ({@link UnitTopicRouter}), since a broker node that makes a queue per subscription needed minutes for one
     * per unit at 10,000 units (docs/broker.md). The plant's login may read every unit's reference.
     */
    public FieldGateway start() {
        MessageBus view = router.route(TopicKind.FIELD_REFERENCE, bus, Qos.AT_LEAST_ONCE).view(bus);
        for (String u : units) {
            view.subscribe(topics.fieldReference(u), Qos.AT_LEAST_ONCE,
                    m -> codec.decode(m.payload(), FieldReference.class).message()
                            .filter(r -> r.unit().equals(u) && Double.isFinite(r.loadReferenceMw()))
                            .ifPresent(r -> pending.put(u, r)));
        }
        return this;
    }

    /** Owner (physics) thread: applies references, publishes readings when due; @return work done */
    public int work() {
        int work = 0;
        for (String u : units) {
            FieldReference r = pending.remove(u);
            if (r != null) {
                sim.setLoadReferenceMw(u, r.loadReferenceMw());
                applied++;
                work++;
            }
        }
        long now = clock.monotonicNanos();
        if (now >= nextReadingNanos) {
            nextReadingNanos += ((now - nextReadingNanos) / periodNanos + 1) * periodNanos;
            if (bus.isConnected()) {
                for (String u : units) {
                    FieldReading reading = new FieldReading(seq++, physicsEpoch.nowEpochMs(), u, sim.outputMw(u),
                            sim.loadReferenceMw(u), DirectTurbineField.statusOf(sim, u));
                    bus.publish(OutboundMessage.of(topics.fieldReading(u), codec.encode(reading), Qos.AT_MOST_ONCE));
                }
            }
            work++;
        }
        return work;
    }

    /** Before the first {@link #work}: the reading period, ms of scenario time, ≥ 1. */
    public FieldGateway periodMs(long periodMs) {
        if (periodMs < 1) {
            throw new IllegalArgumentException("field reading period must be ≥ 1 ms, got " + periodMs);
        }
        this.periodNanos = periodMs * 1_000_000L;
        return this;
    }

    /** @return field references dropped because their unit's interface is not served here (counted, not silent) */
    public long referencesNotServedCount() {
        return router.notServedCount();
    }

    /** @return load references applied since start */
    public long appliedCount() {
        return applied;
    }
}
