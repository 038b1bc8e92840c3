package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.LinkState;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/** The plant loop on a virtual clock and the in-memory bus: deterministic, no broker. */
class PlantAgentTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    final MessageCodec codec = new MessageCodec();
    final VirtualClock clock = new VirtualClock(1_700_000_000_000L);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    final TopicTree topics = TopicTree.forSite("demo-site");
    final Inbox inbox = new Inbox();
    final InMemoryBus tester = broker.connect("tester");

    {
        tester.subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, inbox);
    }

    final List<String> warnings = new java.util.ArrayList<>();

    PlantRunner plant(ConnectionGrouping grouping, Set<String> remote) throws Exception {
        return plant(grouping, remote, 1);
    }

    PlantRunner plant(ConnectionGrouping grouping, Set<String> remote, double rate) throws Exception {
        return plant(grouping, remote, rate, clock);
    }

    PlantRunner plant(ConnectionGrouping grouping, Set<String> remote, double rate, org.loopstand.protocol.time.Clock plantClock)
            throws Exception {
        Grid grid = SiteLoader.load(SITE);
        GridSimulator sim = new GridSimulator(grid);
        List<MeterSettings> meters = List.of(MeterSettings.defaults("north-basin"),
                MeterSettings.defaults("south-ridge").withScanPeriodMs(1_000));
        PlantOptions o = new PlantOptions(rate, remote, grouping, 2, meters,
                InterfaceOptions.defaults().withTelemetryScanMs(2_000, Map.of("ridge-hydro-1", 500L)),
                Qos.AT_MOST_ONCE, 256, 7, 1.0);
        return new PlantRunner(sim, List.of(), o, broker::connect, plantClock, warnings::add);
    }

    void run(PlantRunner p, double s) {
        for (long i = 0, n = Math.round(s / 0.01); i < n; i++) {
            clock.advanceMillis(10);
            p.agent().doWork();
        }
    }

    List<InboundMessage> on(String topic) {
        return inbox.messages().stream().filter(m -> m.topic().equals(topic)).toList();
    }

    void send(UnitCommand c) {
        tester.publish(OutboundMessage.of(topics.unitCommand(c.unit()), codec.encode(c), Qos.AT_LEAST_ONCE));
    }

    <T> List<T> decoded(String topic, Class<T> type) {
        return on(topic).stream().map(m -> codec.decode(m.payload(), type).message().orElseThrow()).toList();
    }

    @Test
    void shouldPublishMetersAndTelemetryOnTheirOwnScanPeriods() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of())) {
            run(p, 20);
            List<AreaMeter> north = decoded(topics.areaMeter("north-basin", "main"), AreaMeter.class);
            List<AreaMeter> south = decoded(topics.areaMeter("south-ridge", "main"), AreaMeter.class);
            assertThat(north).hasSize(11);   // t = 0, 2, ... 20 s
            assertThat(south).hasSize(21);   // every 1 s
            assertThat(north.get(2).sourceTime() - north.get(1).sourceTime()).isEqualTo(2_000);
            AreaMeter last = north.get(north.size() - 1);
            // the last scan ran at most 10 ms before the end; noise 1 mHz σ, 0.5 MW σ
            assertThat(last.frequencyHz()).isCloseTo(p.sim().frequencyHz("north-basin"), within(0.01));
            assertThat(last.ties()).hasSize(1);
            // north-basin is the tie's from-area: + = export; the south sees the same flow as import
            assertThat(last.netInterchangeMw()).isCloseTo(p.sim().netInterchangeMw("north-basin"), within(3.0));
            assertThat(south.get(south.size() - 1).netInterchangeMw()).isCloseTo(-p.sim().tieFlowMw("basin-ridge"), within(3.0));
            assertThat(north.stream().mapToDouble(AreaMeter::frequencyHz).distinct().count()).isGreaterThan(5);
            assertThat(decoded(topics.unitTelemetry("basin-steam-1"), UnitTelemetry.class)).hasSize(11);
            assertThat(decoded(topics.unitTelemetry("ridge-hydro-1"), UnitTelemetry.class)).hasSize(41);
            assertThat(decoded(topics.unitLink("basin-gas-1"), LinkStatus.class).get(0).state()).isEqualTo(LinkState.ONLINE);
        }
    }

    @Test
    void shouldKeepPulseMotionAndScanRatesWhenUnitsRunOnACoarserScan() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.POOLED, Set.of()).unitScanMs(100)) {
            run(p, 240);
            double before = p.sim().loadReferenceMw("basin-steam-1");
            long now = clock.epochMillis();
            int telemetryBefore = on(topics.unitTelemetry("ridge-hydro-1")).size();
            send(UnitCommand.pulse(1, now, "basin-steam-1", "controller-1", 0, now + 8_000, PulseDirection.RAISE, 4_000));
            run(p, 20);
            // same total as after every step: 18 MW/min × 4 s = 1.2 MW, only in 100 ms increments
            assertThat(p.sim().loadReferenceMw("basin-steam-1") - before).isCloseTo(1.2, within(1e-9));
            assertThat(decoded(topics.unitAck("basin-steam-1"), CommandAck.class)).singleElement()
                    .satisfies(a -> assertThat(a.outcome()).isEqualTo(AckOutcome.ACCEPTED));
            // a 500 ms telemetry scan still publishes twice a second (each on the unit's next pass)
            assertThat(on(topics.unitTelemetry("ridge-hydro-1")).size() - telemetryBefore).isBetween(39, 41);
        }
    }

    @Test
    void shouldMoveTheTurbinesReferenceByPulseRateTimesDuration() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.POOLED, Set.of())) {
            run(p, 240); // the demo site starts off balance: let the governors settle first
            double before = p.sim().loadReferenceMw("basin-steam-1");
            long now = clock.epochMillis();
            send(UnitCommand.pulse(1, now, "basin-steam-1", "controller-1", 0, now + 8_000, PulseDirection.RAISE, 4_000));
            run(p, 6);
            // 18 MW/min × 4 s = 1.2 MW
            assertThat(p.sim().loadReferenceMw("basin-steam-1") - before).isCloseTo(1.2, within(1e-9));
            assertThat(decoded(topics.unitAck("basin-steam-1"), CommandAck.class)).singleElement()
                    .extracting(CommandAck::outcome).isEqualTo(AckOutcome.ACCEPTED);
            assertThat(p.unitCycle("basin-steam-1").unit().latency().toOutputUs().getTotalCount()).isEqualTo(1);
        }
    }

    @Test
    void shouldCutOneUnitsLinkAloneInASharedConnection() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.PER_PLANT, Set.of())) {
            run(p, 1);
            tester.publish(OutboundMessage.of(topics.faults(), codec.encode(new org.loopstand.protocol.message.FaultOrder(
                    1, clock.epochMillis(), "cut-1", org.loopstand.protocol.message.FaultAction.START, "unitLinkDown",
                    List.of("basin-steam-2"), Map.of(), null)), Qos.AT_LEAST_ONCE));
            run(p, 0.1);
            int telemetryBefore = on(topics.unitTelemetry("basin-steam-2")).size();
            int otherBefore = on(topics.unitTelemetry("basin-steam-1")).size();
            long now = clock.epochMillis();
            send(UnitCommand.pulse(1, now, "basin-steam-2", "controller-1", 0, now + 8_000, PulseDirection.RAISE, 1_000));
            run(p, 6);
            assertThat(on(topics.unitTelemetry("basin-steam-2"))).hasSize(telemetryBefore);
            assertThat(on(topics.unitTelemetry("basin-steam-1")).size()).isGreaterThan(otherBefore);
            assertThat(on(topics.unitAck("basin-steam-2"))).isEmpty();
            List<LinkStatus> link = decoded(topics.unitLink("basin-steam-2"), LinkStatus.class);
            assertThat(link.get(link.size() - 1).state()).isEqualTo(LinkState.OFFLINE);
            assertThat(link.get(link.size() - 1).clientId()).isEqualTo("demo-site-gateway-north-basin");
        }
    }

    @Test
    void shouldKeepSteppingAndServeOtherUnitsThroughACommandFlood() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of())) {
            run(p, 1);
            long steps = p.sim().stepCount();
            long now = clock.epochMillis();
            // 10,000 commands land at one unit within one cycle: the bus thread never blocks
            for (int i = 1; i <= 10_000; i++) {
                send(UnitCommand.pulse(i, now, "basin-gas-1", "controller-1", 0, now + 8_000, PulseDirection.LOWER, 10));
            }
            send(UnitCommand.pulse(1, now, "basin-steam-1", "controller-1", 0, now + 8_000, PulseDirection.RAISE, 1_000));
            run(p, 1);
            // 1 s at the demo site's 20 ms step = 50 steps, as without the flood
            assertThat(p.sim().stepCount() - steps).isEqualTo(50);
            UnitDutyCycle flooded = p.unitCycle("basin-gas-1");
            assertThat(flooded.link().overflowCount()).isEqualTo(10_000 - 256);
            assertThat(flooded.unit().acceptedCount()).isEqualTo(256);
            assertThat(p.unitCycle("basin-steam-1").unit().acceptedCount()).isEqualTo(1);
            assertThat(p.journal().entries()).anyMatch(e -> e.kind().equals("overflow") && e.unit().equals("basin-gas-1"));
        }
    }

    @Test
    void shouldSayOnceThatItFellBehindAndCatchUpWithoutSlowingTheClock() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of())) {
            run(p, 1);
            assertThat(warnings).isEmpty();
            clock.advanceMillis(3_000); // the loop was held up for 3 s
            for (int i = 0; i < 3; i++) {
                p.agent().doWork(); // 250 steps at most per cycle: 150 steps of 20 ms are due
            }
            assertThat(p.sim().timeS()).isCloseTo(4.0, within(1e-9));
            assertThat(warnings).singleElement().asString().contains("falling behind the clock by 2.9");
            clock.advanceMillis(3_000);
            p.agent().doWork();
            assertThat(warnings).hasSize(1);
            assertThat(p.lateness().histogramUs().getMaxValue()).isGreaterThan(2_900_000L);
        }
    }

    @Test
    void shouldPublishTheScenarioClockEveryScenarioSecondAtEveryRate() throws Exception {
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of(), 10)) {
            run(p, 25);
            List<ClockTick> ticks = decoded(topics.clock(), ClockTick.class);
            // every scenario second (here the virtual clock is the scenario clock): t = 0.01, 1, 2, ... 25 s
            assertThat(ticks).hasSize(26);
            assertThat(ticks).allSatisfy(t -> assertThat(t.rate()).isEqualTo(10));
            assertThat(ticks.get(2).scenarioTimeMs()).isEqualTo(2_000);
            assertThat(on(topics.clock()).get(0).retained()).isFalse(); // live delivery; the broker keeps it
        }
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of())) {
            run(p, 5);
            // at rate 1 too (controllers take scenario time from the clock at every rate): once a scenario second
            List<ClockTick> ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks.subList(26, ticks.size())).extracting(ClockTick::scenarioTimeMs)
                    .containsExactly(0L, 1_000L, 2_000L, 3_000L, 4_000L, 5_000L);
            assertThat(ticks.subList(26, ticks.size())).allSatisfy(t -> assertThat(t.rate()).isEqualTo(1));
        }
    }

    @Test
    void shouldTellTheClockAtOnceWhenItStartsHoldsOrChangesRate() throws Exception {
        // the plant's scenario clock at rate 40 over the virtual wall clock, held until go
        HeldStartClock scenario = new HeldStartClock(clock, 40);
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of(), 40, scenario)) {
            run(p, 0.5); // held: one tick saying the time stands still, nothing more
            assertThat(decoded(topics.clock(), ClockTick.class)).extracting(ClockTick::running).containsExactly(false);
            scenario.release();
            clock.advanceMillis(10);
            p.agent().doWork();
            // go reaches the controller in the same loop pass, not a wall second (40 scenario s) later
            List<ClockTick> ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks).hasSize(2);
            assertThat(ticks.get(1).running()).isTrue();
            assertThat(ticks.get(1).rate()).isEqualTo(40);
            assertThat(ticks.get(1).scenarioTimeMs()).isEqualTo(400); // 10 ms wall at rate 40, stepped to the clock
            run(p, 0.25); // 10 scenario seconds in passes of 0.4 s: the first pass in each scenario second ticks
            ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks.subList(2, ticks.size())).extracting(ClockTick::scenarioTimeMs)
                    .containsExactly(1_200L, 2_000L, 3_200L, 4_000L, 5_200L, 6_000L, 7_200L, 8_000L, 9_200L, 10_000L);
            scenario.hold("test");
            clock.advanceMillis(10);
            p.agent().doWork();
            ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks).hasSize(13);
            assertThat(ticks.get(12).running()).isFalse();
            assertThat(ticks.get(12).scenarioTimeMs()).isEqualTo(10_400); // stands where the hold caught it
            scenario.runAt(20); // the rate for when the hold ends
            scenario.letGo("test");
            clock.advanceMillis(10);
            p.agent().doWork();
            ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks).hasSize(14);
            assertThat(ticks.get(13).running()).isTrue();
            assertThat(ticks.get(13).rate()).isEqualTo(20);
            assertThat(ticks.get(13).scenarioTimeMs()).isEqualTo(10_600); // 10 ms wall at rate 20 after the hold
        }
    }

    @Test
    void shouldHoldTheScenarioClockAtTheLeashWhenTheLoopStallsRatherThanRunThePhysicsLate() throws Exception {
        HeldStartClock scenario = new HeldStartClock(clock, 40);
        try (PlantRunner p = plant(ConnectionGrouping.PER_UNIT, Set.of(), 40, scenario)) {
            List<Map<String, Object>> paceEntries = new java.util.ArrayList<>();
            long stepNanos = Math.round(p.sim().stepS() * 1e9);
            PlantPacing pacing = new PlantPacing(scenario, clock, stepNanos, new PacingSettings(1.0, 1.1, 0.8, 5.0),
                    paceEntries::add).watch(p.lateness());
            scenario.release();
            pacing.started();
            run(p, 0.1); // 4 scenario s, on time
            assertThat(paceEntries).isEmpty();
            clock.advanceMillis(1_000); // the loop misses a wall second: unleashed, the clock would be 40 s ahead
            // every reader sees at most the physics + the 1 s limit: the clock stood there from 25 ms into the stall
            assertThat(scenario.monotonicNanos() / 1e9).isCloseTo(p.sim().timeS() + 1.0, within(1e-9));
            long stoodAtNanos = scenario.monotonicNanos();
            for (int i = 0; i < 20; i++) {
                p.agent().doWork(); // the physics catches up the 1 s (50 steps) in the first pass, the clock runs on
                clock.advanceMillis(10);
            }
            assertThat(paceEntries).singleElement().satisfies(e -> {
                // one stall: the rate is kept, the scenario seconds not run are said
                assertThat(e).containsEntry("event", "paceSlipped").containsEntry("fromRate", 40.0)
                        .containsEntry("toRate", 40.0).containsEntry("limitS", 1.0)
                        .containsEntry("stallWallMs", 975.0) // 1000 ms of stall less the 25 ms the clock ran to the leash
                        .containsEntry("notRunS", 39.0); // 975 ms at 40x
                assertThat((Double) e.get("behindS")).isCloseTo(1.0, within(p.sim().stepS()));
                assertThat((Double) e.get("atS")).isCloseTo(5.0, within(p.sim().stepS())); // 4 s + the 1 s limit
            });
            // no jump, no going back: from where it stood the clock ran on 200 ms of wall at 40x
            assertThat(scenario.monotonicNanos() - stoodAtNanos).isEqualTo(8_000_000_000L);
            p.agent().doWork();
            assertThat(scenario.running()).isTrue();
            assertThat(p.sim().timeS()).isCloseTo(scenario.monotonicNanos() / 1e9, within(p.sim().stepS()));
            List<ClockTick> ticks = decoded(topics.clock(), ClockTick.class);
            assertThat(ticks).extracting(ClockTick::scenarioTimeMs).isSorted();
            assertThat(ticks.get(ticks.size() - 1).rate()).isEqualTo(40.0);
            assertThat(ticks.get(ticks.size() - 1).running()).isTrue();
            pacing.finish(p.sim().timeS());
            assertThat(paceEntries.get(1)).containsEntry("event", "paceSummary").containsEntry("slips", 1L)
                    .containsEntry("slipWallMs", 975.0).containsEntry("notRunS", 39.0).containsEntry("holds", 0L);
        }
    }
}
