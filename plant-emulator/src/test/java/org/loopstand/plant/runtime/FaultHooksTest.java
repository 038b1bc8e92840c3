package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.check.CheckLibrary;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
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

/**
 * The fault stages wired into the plant on the in-memory bus, with a scripted controller (the test
 * publishing commands): what the controller is told and what the units do, against the truth.
 */
class FaultHooksTest {
    /** The plant loop fixture: virtual clock, in-memory broker, a tester connection (not run as tests here). */
    private final PlantAgentTest base = new PlantAgentTest();
    private final org.loopstand.protocol.time.VirtualClock clock = base.clock;
    private final org.loopstand.protocol.topic.TopicTree topics = base.topics;
    private static final java.nio.file.Path SITE = PlantAgentTest.SITE;
    private final List<String> refusals = new ArrayList<>();
    private final List<org.loopstand.plant.fault.Publication> touched = new ArrayList<>();

    private record Rig(PlantRunner plant, FaultEngine engine, RunRecord record) implements AutoCloseable {
        @Override
        public void close() {
            plant.close();
        }
    }

    private Rig rig(FaultSpec.Builder... faults) throws Exception {
        PlantRunner p = base.plant(ConnectionGrouping.PER_UNIT, Set.of());
        RunRecord record = new RunRecord(clock.epochMillis());
        FaultObserver refused = new FaultObserver() {
            @Override
            public void faultRefused(long tMs, String orderId, String reason) {
                refusals.add(reason);
            }

            @Override
            public void published(long tMs, org.loopstand.plant.fault.Publication pub) {
                if (pub.affected()) {
                    touched.add(pub);
                }
            }
        };
        FaultEngine engine = new FaultEngine(clock, clock.epochMillis(), FaultObserver.all(List.of(record, refused)));
        for (FaultSpec.Builder b : faults) {
            assertThat(engine.schedule(b.build())).isEmpty();
        }
        FaultHooks.wire(p, engine, FaultObserver.all(List.of(record, refused)), record, clock, 3, true);
        return new Rig(p, engine, record);
    }

    private FaultSpec.Builder fault(String id, String type, String target, double startS, double endS) throws Exception {
        return FaultSpec.builder(FaultLibrary.standard(), TargetCatalog.of(org.loopstand.plant.site.SiteLoader.load(SITE)))
                .id(id).type(type).target(target).window(startS, endS);
    }

    private UnitCommand pulse(long seq, String unit, PulseDirection d) {
        long now = clock.epochMillis();
        return UnitCommand.pulse(seq, now, unit, "controller-1", 0, now + 8_000, d, 4_000);
    }

    private CheckOutcome expiredRefused(RunRecord record, String unit) throws Exception {
        List<FaultSpec.Problem> problems = new ArrayList<>();
        CheckSpec spec = CheckSpec.assemble("c", CheckLibrary.standard().type("expiredCommandsRefused").orElseThrow(),
                Map.of("unit", unit), TargetCatalog.of(org.loopstand.plant.site.SiteLoader.load(SITE)), problems);
        return spec.evaluate(record, org.loopstand.plant.site.SiteLoader.load(SITE));
    }

    @Test
    void shouldPublishAFrozenMeterWhileTheTruthMoves() throws Exception {
        try (Rig r = rig(fault("fz", "freezeValue", "north-basin", 10, 30))) {
            base.run(r.plant(), 40);
            List<AreaMeter> north = base.decoded(topics.areaMeter("north-basin", "main"), AreaMeter.class);
            List<AreaMeter> frozen = north.stream().filter(m -> m.sourceTime() - 1_700_000_000_000L >= 10_000
                    && m.sourceTime() - 1_700_000_000_000L < 30_000).toList();
            assertThat(frozen).hasSize(10);
            assertThat(frozen).extracting(AreaMeter::frequencyHz).containsOnly(north.get(4).frequencyHz());
            assertThat(frozen).extracting(AreaMeter::seq).doesNotHaveDuplicates();
            assertThat(north.get(16).frequencyHz()).isNotEqualTo(north.get(4).frequencyHz());
        }
    }

    @Test
    void shouldMakeDelayedCommandsArriveExpiredAndRefusedOrActedOnWhenFaulted() throws Exception {
        try (Rig r = rig(fault("d1", "commandDelay", "basin-steam-1", 200, 400).parameter("delayMs", 12_000),
                fault("d2", "commandDelay", "basin-steam-2", 200, 400).parameter("delayMs", 12_000),
                fault("x2", "applyExpired", "basin-steam-2", 200, 400))) {
            // the pace keeper's watch sees each command as it came off the bus: the injected delay is not the path's
            List<Long> agesAtArrivalMs = new ArrayList<>();
            r.plant().watchCommandArrivals((c, receivedNanos) -> agesAtArrivalMs.add(clock.epochMillis()
                    - (clock.monotonicNanos() - receivedNanos) / 1_000_000L - c.issuedAt()));
            base.run(r.plant(), 240);
            double ref1 = r.plant().sim().loadReferenceMw("basin-steam-2");
            base.send(pulse(1, "basin-steam-1", PulseDirection.RAISE));
            base.send(pulse(1, "basin-steam-2", PulseDirection.RAISE));
            base.run(r.plant(), 10);
            assertThat(base.on(topics.unitAck("basin-steam-1"))).isEmpty(); // still on its way
            assertThat(agesAtArrivalMs).containsExactly(0L, 0L);
            base.run(r.plant(), 10);
            CommandAck a1 = base.decoded(topics.unitAck("basin-steam-1"), CommandAck.class).get(0);
            CommandAck a2 = base.decoded(topics.unitAck("basin-steam-2"), CommandAck.class).get(0);
            assertThat(a1.reason()).isEqualTo(RefusalReason.EXPIRED);
            assertThat(a2.outcome()).isEqualTo(AckOutcome.ACCEPTED);
            // 16 MW/min × 4 s = 1.067 MW moved by a command that should have been refused
            assertThat(r.plant().sim().loadReferenceMw("basin-steam-2") - ref1).isCloseTo(16 * 4 / 60.0, within(1e-9));
            CheckOutcome ok = expiredRefused(r.record(), "basin-steam-1");
            CheckOutcome bad = expiredRefused(r.record(), "basin-steam-2");
            assertThat(ok.passed()).isTrue();
            assertThat(bad.passed()).isFalse();
            assertThat(bad.decidingFigure()).isEqualTo(1);
        }
    }

    @Test
    void shouldAckIgnoredPulsesAndSwapRaiseAndLower() throws Exception {
        try (Rig r = rig(fault("ig", "ignorePulses", "basin-steam-1", 0, 1000), fault("sw", "swapRaiseLower", "basin-gas-1", 0, 1000))) {
            base.run(r.plant(), 240);
            double steam = r.plant().sim().loadReferenceMw("basin-steam-1");
            double gas = r.plant().sim().loadReferenceMw("basin-gas-1");
            base.send(pulse(1, "basin-steam-1", PulseDirection.RAISE));
            base.send(pulse(1, "basin-gas-1", PulseDirection.RAISE));
            base.run(r.plant(), 6);
            assertThat(base.decoded(topics.unitAck("basin-steam-1"), CommandAck.class).get(0).outcome()).isEqualTo(AckOutcome.ACCEPTED);
            assertThat(r.plant().sim().loadReferenceMw("basin-steam-1")).isEqualTo(steam);
            // 30 MW/min × 4 s = 2 MW, lowered instead of raised
            assertThat(r.plant().sim().loadReferenceMw("basin-gas-1") - gas).isCloseTo(-2.0, within(1e-9));
            assertThat(r.record().commands()).extracting(RunRecord.CommandRecord::acted).containsExactly(false, true);
        }
    }

    @Test
    void shouldSwitchToLocalRefuseAndComeBackAndTripTheUnit() throws Exception {
        try (Rig r = rig(fault("lc", "switchToLocal", "basin-gas-1", 10, 30), fault("tr", "plantTrip", "ridge-hydro-2", 5, 6))) {
            base.run(r.plant(), 20);
            base.send(pulse(1, "basin-gas-1", PulseDirection.RAISE));
            base.run(r.plant(), 2);
            assertThat(base.decoded(topics.unitAck("basin-gas-1"), CommandAck.class).get(0).reason()).isEqualTo(RefusalReason.NOT_IN_REMOTE);
            List<UnitTelemetry> t = base.decoded(topics.unitTelemetry("basin-gas-1"), UnitTelemetry.class);
            assertThat(t.get(t.size() - 1).controlMode()).isEqualTo(ControlMode.LOCAL);
            base.run(r.plant(), 12);
            t = base.decoded(topics.unitTelemetry("basin-gas-1"), UnitTelemetry.class);
            assertThat(t.get(t.size() - 1).controlMode()).isEqualTo(ControlMode.REMOTE);
            assertThat(r.plant().sim().isTripped("ridge-hydro-2")).isTrue();
            assertThat(r.plant().sim().isTripped("ridge-hydro-1")).isFalse();
        }
    }

    @Test
    void shouldTakeLiveOrdersAndLeaveOperatorOrdersToThePlant() throws Exception {
        try (Rig r = rig()) {
            base.run(r.plant(), 10);
            long now = clock.epochMillis();
            order(new FaultOrder(1, now, "op-1", FaultAction.START, "bias", List.of("south-ridge"), Map.of("offsetMhz", 200), 10.0));
            order(new FaultOrder(2, now, "op-2", FaultAction.START, "setControlMode", List.of("basin-gas-1"), Map.of("mode", "off"),
                    null));
            order(new FaultOrder(3, now, "op-3", FaultAction.START, "bias", List.of("west-lake"), Map.of(), null));
            base.run(r.plant(), 5);
            // the south meter scans every second: 5 scans under the bias, each 200 mHz off its own truth
            assertThat(touched).hasSize(5).allSatisfy(pub -> assertThat(((AreaMeter) pub.published()).frequencyHz()
                    - ((AreaMeter) pub.truth()).frequencyHz()).isCloseTo(0.2, within(1e-9)));
            List<AreaMeter> sent = base.decoded(topics.areaMeter("south-ridge", "main"), AreaMeter.class);
            AreaMeter lastSent = sent.get(sent.size() - 1);
            assertThat(lastSent).isEqualTo(touched.get(4).published());
            assertThat(r.plant().unitCycle("basin-gas-1").unit().controlMode()).isEqualTo(ControlMode.OFF);
            assertThat(refusals).singleElement().asString().contains("unknown target 'west-lake'");
            base.run(r.plant(), 10);
            assertThat(r.engine().active()).isEmpty();
        }
    }

    private void order(FaultOrder o) {
        base.tester.publish(OutboundMessage.of(topics.faults(), base.codec.encode(o), Qos.AT_LEAST_ONCE));
    }
}
