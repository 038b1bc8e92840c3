package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicLong;

import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The fault stage between "record built from the physics" and {@link MessageBus#publish}: each active
 * {@link StreamFault} shapes the outgoing copy (stale, clock, value), then rules on its loss, then on
 * its delay and copies; the truth record is left as it is and
 * both are told to the {@link FaultObserver}. Delayed messages wait in a bounded {@link DelayLine}
 * released by {@link #doWork()} on the injected clock; nothing here sleeps. Single-threaded: the agent
 * that builds the records calls every method.
 */
public final class FaultyPublisher implements Agent {
    /** Default most messages held back at once. */
    public static final int DEFAULT_DELAY_CAPACITY = 10_000;

    private final String connectionId;
    private final MessageBus bus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final FaultEngine engine;
    private final TargetCatalog catalog;
    private final FaultObserver observer;
    private final Clock clock;
    private final Qos measurementQos;
    private final SplittableRandom random;
    private final DelayLine<Pending> delayLine;
    private final Map<String, StreamMemory> streams = new HashMap<>();
    private final AtomicLong busFailures = new AtomicLong();

    /**
     * @param connectionId   the bus connection this publisher uses ({@link TargetCatalog#PLANT_CONNECTION}
     *                       or a unit id); a connection fault on it drops everything while it lasts
     * @param measurementQos QoS of meter and telemetry messages (contract default: 0)
     * @param seed           seeds loss, jitter and noise draws, so a study run repeats exactly
     * @param delayCapacity  most messages held back at once, ≥ 1
     */
    public FaultyPublisher(String connectionId, MessageBus bus, TopicTree topics, MessageCodec codec, FaultEngine engine,
            TargetCatalog catalog, FaultObserver observer, Clock clock, Qos measurementQos, long seed, int delayCapacity) {
        this.connectionId = connectionId;
        this.bus = bus;
        this.topics = topics;
        this.codec = codec;
        this.engine = engine;
        this.catalog = catalog;
        this.observer = observer;
        this.clock = clock;
        this.measurementQos = measurementQos;
        this.random = new SplittableRandom(seed);
        this.delayLine = new DelayLine<>(delayCapacity);
    }

    /** Publishes one area meter scan through the fault stage. */
    public void publishMeter(AreaMeter truth) {
        List<FaultSpec> faults = new ArrayList<>();
        for (FaultSpec f : engine.active(TargetKind.AREA, truth.area())) {
            String meter = f.meter();
            if (f.behaviour() instanceof StreamFault
                    && (meter == null || meter.equals(FaultLibrary.ALL_METERS) || meter.equals(truth.meter()))) {
                faults.add(f);
            }
        }
        process("meter/" + truth.area() + "/" + truth.meter(), topics.areaMeter(truth.area(), truth.meter()), truth,
                faults, catalog.nominalHz(truth.area()));
    }

    /** Publishes one unit telemetry scan through the fault stage. */
    public void publishTelemetry(UnitTelemetry truth) {
        List<FaultSpec> faults = new ArrayList<>();
        for (FaultSpec f : engine.active(TargetKind.UNIT, truth.unit())) {
            if (f.behaviour() instanceof StreamFault) {
                faults.add(f);
            }
        }
        process("telemetry/" + truth.unit(), topics.unitTelemetry(truth.unit()), truth, faults, 0);
    }

    /** Releases the held messages that are due. @return how many were published */
    @Override
    public int doWork() {
        List<Pending> due = delayLine.due(clock.monotonicNanos());
        for (Pending p : due) {
            send(p);
        }
        return due.size();
    }

    @Override
    public String roleName() {
        return "fault-publisher-" + connectionId;
    }

    /** @return messages waiting in the delay line */
    public int held() {
        return delayLine.size();
    }

    /** @return publishes the bus reported as failed */
    public long busFailures() {
        return busFailures.get();
    }

    private void process(String stream, String topic, Object truth, List<FaultSpec> faults, double nominalHz) {
        StreamMemory st = streams.computeIfAbsent(stream, k -> new StreamMemory());
        st.forgetEnded(faults);
        if (engine.connectionDown(connectionId)) {
            List<String> ids = engine.active(FaultCategory.CONNECTION, TargetKind.CONNECTION, connectionId).stream()
                    .map(FaultSpec::id).toList();
            observer.published(clock.epochMillis(), new Publication(stream, topic, truth, null, Publication.LINK_DOWN, ids,
                    "connection " + connectionId + " is down"));
            st.lastTruth = truth;
            return;
        }
        List<String> ids = faults.stream().map(FaultSpec::id).toList();
        List<StreamFault> kinds = new ArrayList<>();
        MessageDraft draft = new MessageDraft(truth, st);
        for (FaultSpec f : faults) {
            StreamFault k = (StreamFault) f.behaviour();
            kinds.add(k);
            draft.activeForS(engine.activeForS(f));
            k.shape(f, draft);
        }
        Object rec = draft.record();
        st.lastTruth = truth;
        st.counted(faults);
        if (!draft.repeated()) {
            if (!draft.values().isEmpty()) {
                rec = rec instanceof AreaMeter m ? ValueFaults.apply(m, draft.values(), nominalHz, random)
                        : ValueFaults.apply((UnitTelemetry) rec, draft.values(), random);
            }
            if (draft.clockShiftMs() != 0) {
                rec = Records.withSourceTime(rec, Records.sourceTime(rec) + draft.clockShiftMs());
            }
        }
        String lost = null;
        for (StreamFault k : kinds) {
            String why = k.lossVerdict(st, random);
            if (why != null) {
                lost = why;
            }
        }
        if (lost != null) {
            observer.published(clock.epochMillis(), new Publication(stream, topic, truth, null, Publication.DROPPED, ids, lost));
            return;
        }
        byte[] bytes;
        try {
            bytes = codec.encode(rec);
        } catch (IllegalArgumentException e) {
            observer.published(clock.epochMillis(), new Publication(stream, topic, truth, null, Publication.UNENCODABLE, ids,
                    e.getMessage()));
            return;
        }
        long delayMs = 0;
        int copies = 1;
        for (StreamFault k : kinds) {
            delayMs += k.delayMs(random);
            copies += k.extraCopies(random);
        }
        for (int c = 0; c < copies; c++) {
            String detail = (delayMs > 0 ? "held " + delayMs + " ms" : "") + (c > 0 ? (delayMs > 0 ? ", " : "") + "copy " + c : "");
            Pending p = new Pending(st, stream, topic, truth, rec, bytes, ids, detail);
            if (delayMs == 0) {
                send(p);
            } else if (!delayLine.offer(clock.monotonicNanos() + delayMs * 1_000_000L, p)) {
                observer.published(clock.epochMillis(), new Publication(stream, topic, truth, null, Publication.QUEUE_FULL,
                        ids, "delay line full (" + held() + " messages held)"));
            }
        }
    }

    private void send(Pending p) {
        if (engine.connectionDown(connectionId)) {
            observer.published(clock.epochMillis(), new Publication(p.stream, p.topic, p.truth, null, Publication.LINK_DOWN,
                    p.faultIds, "connection " + connectionId + " went down while the message was held"));
            return;
        }
        bus.publish(new OutboundMessage(p.topic, p.bytes, measurementQos, false, 0)).whenComplete((ok, failure) -> {
            if (failure != null) {
                busFailures.incrementAndGet();
            }
        });
        p.state.lastSent = p.published;
        observer.published(clock.epochMillis(), new Publication(p.stream, p.topic, p.truth, p.published, Publication.SENT,
                p.faultIds, p.detail));
    }

    private record Pending(StreamMemory state, String stream, String topic, Object truth, Object published, byte[] bytes,
                           List<String> faultIds, String detail) {
    }
}
