package org.loopstand.controller.pulsetest;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import org.loopstand.controller.pulsetest.governor.GovernorAnswerTracker;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.time.Clock;

/**
 * What a pulse test heard from its unit and the unit's area: telemetry, good area frequency and the
 * unit's acks to the test's commands. Messages arrive on bus threads ({@link #receive}), are stamped on
 * arrival with the test's clock (the plant's clock may be offset from it) and are decoded on the agent
 * thread by {@link #drain()}.
 */
final class UnitObservations {
    private final String unitId;
    private final String controllerId;
    private final Clock clock;
    private final MessageCodec codec = new MessageCodec();
    private final ConcurrentLinkedQueue<Arrival> inbox = new ConcurrentLinkedQueue<>();
    private final List<TelemetryPoint> telemetry = new ArrayList<>();
    private final List<FrequencyPoint> frequency = new ArrayList<>();
    private final Map<Long, CommandAck> acks = new HashMap<>();
    private GovernorAnswerTracker governorTracker;
    private UnitTelemetry latest;
    private long lastGoodMs = -1;

    private record Arrival(InboundMessage message, Class<?> type, long atMs) {
    }

    /**
     * @param unitId       the unit under test: telemetry of other units is ignored
     * @param controllerId acks to other controllers are ignored
     * @param clock        stamps each arrival, epoch ms
     */
    UnitObservations(String unitId, String controllerId, Clock clock) {
        this.unitId = unitId;
        this.controllerId = controllerId;
        this.clock = clock;
    }

    /** Removes the tracker's expected governor answer from every later reading; null: none. */
    void trackGovernor(GovernorAnswerTracker tracker) {
        this.governorTracker = tracker;
    }

    /** Queues a message of {@code type} (UnitTelemetry, CommandAck or AreaMeter); any thread. */
    void receive(InboundMessage m, Class<?> type) {
        inbox.add(new Arrival(m, type, clock.epochMillis()));
    }

    /** Decodes everything queued; agent thread. @return number of messages taken */
    int drain() {
        int n = 0;
        Arrival a;
        while ((a = inbox.poll()) != null) {
            n++;
            long at = a.atMs();
            if (a.type() == AreaMeter.class) {
                codec.decode(a.message().payload(), AreaMeter.class).message()
                        .filter(f -> f.frequencyQuality().validity() == Validity.GOOD)
                        .ifPresent(f -> onFrequency(f.frequencyHz(), at));
            } else if (a.type() == UnitTelemetry.class) {
                codec.decode(a.message().payload(), UnitTelemetry.class).message().filter(t -> t.unit().equals(unitId))
                        .ifPresent(t -> onTelemetry(t, at));
            } else {
                codec.decode(a.message().payload(), CommandAck.class)
                        .message().filter(ack -> ack.controllerId().equals(controllerId))
                        .ifPresent(ack -> acks.putIfAbsent(ack.commandSeq(), ack));
            }
        }
        return n;
    }

    private void onFrequency(double hz, long at) {
        if (governorTracker != null && Double.isFinite(hz)) {
            frequency.add(new FrequencyPoint(at, hz));
            governorTracker.frequency(at, hz);
        }
    }

    private void onTelemetry(UnitTelemetry t, long at) {
        boolean good = t.outputQuality().validity() == Validity.GOOD;
        double governorMw = governorTracker == null ? Double.NaN : governorTracker.answerMwAt(at);
        telemetry.add(new TelemetryPoint(at, t.outputMw(), t.setpointMw(), good, governorMw));
        latest = t;
        if (good) {
            lastGoodMs = at;
        }
    }

    /** @return every reading of the unit so far, in arrival order (live list) */
    List<TelemetryPoint> telemetry() {
        return telemetry;
    }

    /** @return good area frequency so far, only while a governor answer is removed (live list) */
    List<FrequencyPoint> frequency() {
        return frequency;
    }

    /** @return the unit's first ack to each command seq (live map) */
    Map<Long, CommandAck> acks() {
        return acks;
    }

    /** @return the last telemetry of the unit, or null before the first */
    UnitTelemetry latest() {
        return latest;
    }

    /** @return when the last good reading arrived, epoch ms, or -1 before the first */
    long lastGoodMs() {
        return lastGoodMs;
    }

    /** @return the last reading as recorded, or null before the first */
    TelemetryPoint lastPoint() {
        return telemetry.isEmpty() ? null : telemetry.get(telemetry.size() - 1);
    }
}
