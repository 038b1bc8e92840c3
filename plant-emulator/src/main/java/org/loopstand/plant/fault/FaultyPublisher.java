package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.EnumSet;
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
 * The fault stage between "record built from the physics" and {@link MessageBus#publish}: stale,
 * value, clock, loss and delivery faults act here on a copy, the truth record is left as it is and
 * both are told to the {@link FaultObserver}. Delayed messages wait in a bounded {@link DelayLine}
 * released by {@link #doWork()} on the injected clock; nothing here sleeps. Single-threaded: the agent
 * that builds the records calls every method.
 */
public final class FaultyPublisher implements Agent {
    /** Default most messages held back at once. */
    public static final int DEFAULT_DELAY_CAPACITY = 10_000;

    private static final EnumSet<FaultCategory> STREAM_CATEGORIES = EnumSet.of(FaultCategory.LOSS, FaultCategory.STALE,
            FaultCategory.TIMING, FaultCategory.VALUE);

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
    private final Map<String, StreamState> streams = new HashMap<>();
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
            String meter = (String) f.parameters().get("meter");
            if (STREAM_CATEGORIES.contains(f.type().category())
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
            if (STREAM_CATEGORIES.contains(f.type().category())) {
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
        StreamState st = streams.computeIfAbsent(stream, k -> new StreamState());
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
        Object rec = truth;
        boolean repeated = false;
        List<ValueFaults.Applied> values = new ArrayList<>();
        long clockShiftMs = 0;
        for (FaultSpec f : faults) {
            double activeS = engine.activeForS(f);
            switch (f.type().name()) {
                case "repeatLast" -> {
                    if (st.lastSent != null) {
                        rec = st.lastSent;
                        repeated = true;
                    }
                }
                case "freezeValue" -> rec = Records.withValuesOf(rec,
                        st.frozen.computeIfAbsent(f.id(), k -> st.lastTruth != null ? st.lastTruth : truth));
                case "freezeTimestamp" -> rec = Records.withSourceTime(rec, st.frozenTime.computeIfAbsent(f.id(),
                        k -> Records.sourceTime(st.lastTruth != null ? st.lastTruth : truth)));
                case "clockOffset" -> clockShiftMs += Math.round(f.number("offsetMs"));
                case "clockDrift" -> clockShiftMs += Math.round(f.number("driftMsPerS") * activeS);
                case "holdLast" -> values.add(new ValueFaults.Applied(f, activeS, st.count(f.id()),
                        st.frozen.computeIfAbsent(f.id(), k -> st.lastTruth != null ? st.lastTruth : truth)));
                default -> {
                    if (f.type().category() == FaultCategory.VALUE) {
                        values.add(new ValueFaults.Applied(f, activeS, st.count(f.id())));
                    }
                }
            }
        }
        st.lastTruth = truth;
        faults.forEach(f -> st.counts.merge(f.id(), 1, Integer::sum));
        if (!repeated) {
            if (!values.isEmpty()) {
                rec = rec instanceof AreaMeter m ? ValueFaults.apply(m, values, nominalHz, random)
                        : ValueFaults.apply((UnitTelemetry) rec, values, random);
            }
            if (clockShiftMs != 0) {
                rec = Records.withSourceTime(rec, Records.sourceTime(rec) + clockShiftMs);
            }
        }
        String lost = lossVerdict(st, faults);
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
        for (FaultSpec f : faults) {
            switch (f.type().name()) {
                case "delay" -> delayMs += Math.round(f.number("delayMs") + random.nextDouble() * f.number("jitterMs"));
                case "reorder" -> {
                    if (random.nextDouble() < f.number("reorderProbability")) {
                        delayMs += Math.round(f.number("holdMs"));
                    }
                }
                case "duplicate" -> {
                    if (random.nextDouble() < f.number("duplicateProbability")) {
                        copies += (int) Math.round(f.number("copies"));
                    }
                }
                default -> {
                }
            }
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

    private String lossVerdict(StreamState st, List<FaultSpec> faults) {
        String lost = null;
        for (FaultSpec f : faults) {
            switch (f.type().name()) {
                case "blackout" -> lost = "blackout";
                case "drop" -> {
                    if (random.nextDouble() < f.number("dropProbability")) {
                        lost = "dropped";
                    }
                }
                case "burstLoss" -> {
                    if (st.burstLeft > 0) {
                        st.burstLeft--;
                        lost = "in a loss burst";
                    } else if (random.nextDouble() < f.number("burstStartProbability")) {
                        st.burstLeft = (int) Math.round(f.number("burstLengthMessages")) - 1;
                        lost = "a loss burst started";
                    }
                }
                default -> {
                }
            }
        }
        return lost;
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

    private record Pending(StreamState state, String stream, String topic, Object truth, Object published, byte[] bytes,
                           List<String> faultIds, String detail) {
    }

    /** What the stale and loss faults remember about one stream. */
    private static final class StreamState {
        Object lastTruth;
        Object lastSent;
        int burstLeft;
        final Map<String, Object> frozen = new HashMap<>();
        final Map<String, Long> frozenTime = new HashMap<>();
        final Map<String, Integer> counts = new HashMap<>();

        int count(String faultId) {
            return counts.getOrDefault(faultId, 0);
        }

        void forgetEnded(List<FaultSpec> active) {
            List<String> ids = active.stream().map(FaultSpec::id).toList();
            frozen.keySet().retainAll(ids);
            frozenTime.keySet().retainAll(ids);
            counts.keySet().retainAll(ids);
            if (active.stream().noneMatch(f -> f.type().name().equals("burstLoss"))) {
                burstLeft = 0;
            }
        }
    }
}
