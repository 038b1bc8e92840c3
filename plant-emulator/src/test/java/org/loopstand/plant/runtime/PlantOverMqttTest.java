package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.awaitility.Awaitility.await;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;

import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.plant.broker.SharedEmbeddedBroker;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.testing.Mosquitto;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/** The plant in real time against the embedded broker and the system Mosquitto. */
class PlantOverMqttTest {
    static final String UNIT = "ridge-hydro-1"; // pulse rate 50 MW/min
    final MessageCodec codec = new MessageCodec();

    @TempDir
    Path dir;

    static Stream<String> brokers() {
        return Stream.of(SharedEmbeddedBroker.serverUri(), Mosquitto.system());
    }

    record Rig(PlantRunner plant, MqttLink tester, Inbox inbox, TopicTree topics) implements AutoCloseable {
        List<InboundMessage> on(String topic) {
            return inbox.messages().stream().filter(m -> m.topic().equals(topic)).toList();
        }

        @Override
        public void close() {
            plant.close();
            List<String> retained = new ArrayList<>();
            plant.sim().grid().units().forEach(u -> retained.add(topics.unitLink(u.id())));
            TestSite.clearRetained(tester, retained);
            tester.close();
        }
    }

    Rig rig(String uri, Map<String, Long> telemetryScan, long meterScanMs) throws Exception {
        Grid grid = TestSite.load(TestSite.write(dir));
        TopicTree topics = TopicTree.forSite(grid.siteId());
        MqttLink tester = TestSite.client(uri, grid.siteId() + "-tester");
        Inbox inbox = new Inbox();
        tester.subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, inbox);
        PlantOptions o = new PlantOptions(1, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                grid.areas().stream().map(a -> MeterSettings.defaults(a.id()).withScanPeriodMs(meterScanMs)).toList(),
                InterfaceOptions.defaults().withTelemetryScanMs(2_000, telemetryScan).withMaxPulseMs(10_000),
                Qos.AT_MOST_ONCE, 256, 1, 1.0);
        PlantRunner plant = new PlantRunner(new GridSimulator(grid), List.of(), o, TestSite.mqtt(uri), WallClock.INSTANCE,
                s -> { }).start();
        await().atMost(Duration.ofSeconds(15)).until(() -> plant.buses().stream().allMatch(b -> b.isConnected()));
        return new Rig(plant, tester, inbox, topics);
    }

    void send(Rig r, UnitCommand c) throws Exception {
        r.tester().publish(new OutboundMessage(r.topics().unitCommand(c.unit()), codec.encode(c), Qos.AT_LEAST_ONCE, false, 10))
                .get();
    }

    <T> List<T> decoded(List<InboundMessage> ms, Class<T> type) {
        return ms.stream().map(m -> codec.decode(m.payload(), type).message().orElseThrow()).toList();
    }

    @ParameterizedTest
    @MethodSource("brokers")
    void shouldDeliverTelemetryAndMetersAtTheirScanPeriods(String uri) throws Exception {
        try (Rig r = rig(uri, Map.of(UNIT, 250L), 500)) {
            String telemetry = r.topics().unitTelemetry(UNIT);
            String meter = r.topics().areaMeter("south-ridge", "main");
            await().atMost(Duration.ofSeconds(20)).until(() -> r.on(telemetry).size() >= 13 && r.on(meter).size() >= 7);
            for (var check : List.of(Map.entry(telemetry, 250L), Map.entry(meter, 500L))) {
                List<InboundMessage> ms = r.on(check.getKey());
                // mean interval between arrivals over the run, ±10 % (the acceptance figure)
                double meanMs = (ms.get(ms.size() - 1).receivedNanos() - ms.get(1).receivedNanos()) / 1e6 / (ms.size() - 2);
                assertThat(meanMs).as(check.getKey()).isCloseTo(check.getValue(), within(check.getValue() * 0.10));
            }
            List<UnitTelemetry> t = decoded(r.on(telemetry), UnitTelemetry.class);
            assertThat(t.get(t.size() - 1).pulseRateMwPerMin()).isEqualTo(50);
            assertThat(t.get(t.size() - 1).controlMode()).isEqualTo(ControlMode.REMOTE);
            List<AreaMeter> m = decoded(r.on(meter), AreaMeter.class);
            assertThat(m).extracting(AreaMeter::seq).isSorted().doesNotHaveDuplicates();
            assertThat(m.get(m.size() - 1).ties()).singleElement().satisfies(f -> assertThat(f.tie()).isEqualTo("basin-ridge"));
        }
    }

    @ParameterizedTest
    @MethodSource("brokers")
    void shouldMoveLoadReferenceByPulseRateTimesDuration(String uri) throws Exception {
        try (Rig r = rig(uri, Map.of(), 2_000)) {
            UnitDutyCycle host = r.plant().unitCycle(UNIT);
            await().atMost(Duration.ofSeconds(10)).until(() -> !Double.isNaN(host.unit().loadReferenceMw()));
            double before = r.plant().sim().loadReferenceMw(UNIT);
            long now = WallClock.INSTANCE.epochMillis();
            send(r, UnitCommand.pulse(now, now, UNIT, "controller-1", 0, now + 8_000, PulseDirection.RAISE, 1_200));
            // 50 MW/min × 1.2 s = 1.0 MW, spread over 1.2 s
            await().atMost(Duration.ofSeconds(10)).untilAsserted(() ->
                    assertThat(r.plant().sim().loadReferenceMw(UNIT) - before).isCloseTo(1.0, within(1e-6)));
            await().atMost(Duration.ofSeconds(5)).until(() -> !r.on(r.topics().unitAck(UNIT)).isEmpty());
            assertThat(decoded(r.on(r.topics().unitAck(UNIT)), CommandAck.class)).singleElement()
                    .extracting(CommandAck::outcome).isEqualTo(AckOutcome.ACCEPTED);
        }
    }

    @ParameterizedTest
    @MethodSource("brokers")
    void shouldRefuseEveryFaultyCommandAndNotMoveTheReference(String uri) throws Exception {
        try (Rig r = rig(uri, Map.of(), 2_000)) {
            UnitDutyCycle host = r.plant().unitCycle(UNIT);
            await().atMost(Duration.ofSeconds(10)).until(() -> !Double.isNaN(host.unit().loadReferenceMw()));
            long now = WallClock.INSTANCE.epochMillis();
            long s = now;
            String c = "controller-1";
            // a newer epoch first, so epoch 0 is old afterwards; then the refusals, one per reason
            send(r, UnitCommand.pulse(s, now, UNIT, c, 5, now + 8_000, PulseDirection.RAISE, 1));
            List<UnitCommand> bad = List.of(
                    UnitCommand.pulse(s + 1, now - 9_000, UNIT, c, 5, now - 1_000, PulseDirection.RAISE, 1_000),     // expired
                    UnitCommand.pulse(s + 1, now, UNIT, c, 5, now + 8_000, PulseDirection.RAISE, 1_000),               // duplicate
                    UnitCommand.pulse(s - 5, now, UNIT, c, 5, now + 8_000, PulseDirection.RAISE, 1_000),               // outOfOrder
                    UnitCommand.pulse(s + 2, now, UNIT, "rogue", 5, now + 8_000, PulseDirection.RAISE, 1_000),         // wrongController
                    UnitCommand.pulse(s + 3, now, UNIT, c, 4, now + 8_000, PulseDirection.RAISE, 1_000),               // wrongEpoch
                    UnitCommand.pulse(s + 4, now, UNIT, c, 5, now + 8_000, PulseDirection.RAISE, 10_001));             // pulseTooLong
            for (UnitCommand b : bad) {
                send(r, b);
            }
            r.tester().publish(new OutboundMessage(r.topics().unitCommand(UNIT),
                    "{\"seq\":77,\"controllerId\":\"controller-1\",\"kind\":\"pulse\"}".getBytes(), Qos.AT_LEAST_ONCE, false, 0)).get();
            await().atMost(Duration.ofSeconds(10)).until(() -> r.on(r.topics().unitAck(UNIT)).size() >= 8);
            double held = r.plant().sim().loadReferenceMw(UNIT);
            // local mode, then notInRemote
            r.tester().publish(OutboundMessage.of(r.topics().faults(), codec.encode(new FaultOrder(1, now, "op-1",
                    FaultAction.START, "setControlMode", List.of(UNIT), Map.of("mode", "local"), null)), Qos.AT_LEAST_ONCE)).get();
            await().atMost(Duration.ofSeconds(5)).until(() -> host.unit().controlMode() == ControlMode.LOCAL);
            send(r, UnitCommand.pulse(s + 5, now, UNIT, c, 5, now + 8_000, PulseDirection.RAISE, 1_000));
            await().atMost(Duration.ofSeconds(10)).until(() -> r.on(r.topics().unitAck(UNIT)).size() >= 9);

            List<CommandAck> acks = decoded(r.on(r.topics().unitAck(UNIT)), CommandAck.class);
            assertThat(acks.get(0).outcome()).isEqualTo(AckOutcome.ACCEPTED);
            assertThat(acks.subList(1, acks.size())).extracting(CommandAck::reason).containsExactly(
                    RefusalReason.EXPIRED, RefusalReason.DUPLICATE, RefusalReason.OUT_OF_ORDER, RefusalReason.WRONG_CONTROLLER,
                    RefusalReason.WRONG_EPOCH, RefusalReason.PULSE_TOO_LONG, RefusalReason.MALFORMED, RefusalReason.NOT_IN_REMOTE);
            assertThat(acks.get(7).commandSeq()).isEqualTo(77);
            assertThat(r.plant().sim().loadReferenceMw(UNIT)).isEqualTo(held);
            assertThat(host.unit().refusalCounts().keySet()).containsAll(EnumSet.of(RefusalReason.EXPIRED,
                    RefusalReason.DUPLICATE, RefusalReason.NOT_IN_REMOTE, RefusalReason.MALFORMED));
            assertThat(r.plant().journal().entries()).filteredOn(e -> e.kind().equals("refused")).hasSize(8);
        }
    }
}
