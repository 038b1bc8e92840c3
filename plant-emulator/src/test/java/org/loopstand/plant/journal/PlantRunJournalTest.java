package org.loopstand.plant.journal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.scenario.PhysicsEvents;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/** The plant's run journal on a virtual clock and the in-memory bus: every agreed kind and field. */
class PlantRunJournalTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    final MessageCodec codec = new MessageCodec();
    final VirtualClock clock = new VirtualClock(1_700_000_000_000L);
    /**
     * The journal's flush clock, moved with the scenario clock: a writer thread that lags behind the whole run
     * has seen every flush fall due before it wrote the last entries, so the wait below moves it on too.
     */
    final VirtualClock flushClock = new VirtualClock(1_700_000_000_000L);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    final TopicTree topics = TopicTree.forSite("demo-site");
    final InMemoryBus tester = broker.connect("tester");

    @TempDir
    Path dir;

    PlantRunner plant() throws Exception {
        return plant(0);
    }

    PlantRunner plant(int journalQueue) throws Exception {
        Grid grid = SiteLoader.load(SITE);
        PlantOptions o = new PlantOptions(1, Set.of(), ConnectionGrouping.PER_UNIT, 2,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")),
                InterfaceOptions.defaults(), Qos.AT_MOST_ONCE, 256, 7, 1.0);
        PlantRunner p = new PlantRunner(new GridSimulator(grid), List.of(new PhysicsEvents.LoadStep(2, "north-basin", 50)),
                o, broker::connect, clock, w -> { });
        p.journalTo(PlantRunJournal.create(dir, p.agent().epochMsAt(0), Map.of("site", "demo-site", "rate", 1.0), clock,
                flushClock, journalQueue), 1.0);
        p.agent().endAt(10);
        return p;
    }

    void run(PlantRunner p, double s) {
        for (long i = 0, n = Math.round(s / 0.01); i < n; i++) {
            clock.advanceMillis(10);
            flushClock.advanceMillis(10);
            p.agent().doWork();
        }
    }

    void send(UnitCommand c) {
        tester.publish(OutboundMessage.of(topics.unitCommand(c.unit()), codec.encode(c), Qos.AT_LEAST_ONCE));
    }

    /** 0: written on the plant loop's thread; 65,536: behind the queue, written on the journal's own thread. */
    @org.junit.jupiter.params.ParameterizedTest
    @org.junit.jupiter.params.provider.ValueSource(ints = {0, 65_536})
    void shouldJournalTruthPublishedCommandsEventsAndFaultsAndEndWhenTheScenarioEnds(int journalQueue) throws Exception {
        PlantRunner p = plant(journalQueue);
        run(p, 3);
        long now = clock.epochMillis();
        send(UnitCommand.pulse(1, now, "basin-steam-1", "controller-1", 0, now + 8_000, PulseDirection.RAISE, 4_000));
        send(UnitCommand.pulse(2, now - 9_000, "basin-steam-1", "controller-1", 0, now - 1_000, PulseDirection.RAISE, 1_000));
        tester.publish(OutboundMessage.of(topics.faults(), codec.encode(new FaultOrder(1, now, "order-1", FaultAction.START,
                "setControlMode", List.of("basin-gas-1"), Map.of("mode", "local"), null)), Qos.AT_LEAST_ONCE));
        run(p, 9);
        assertThat(p.agent().finished()).isTrue();
        assertThat(p.sim().timeS()).isCloseTo(10.0, within(1e-9));

        // flushed while running (flush clock = the virtual clock, 1 s interval): readable, not yet ended
        org.awaitility.Awaitility.await().atMost(java.time.Duration.ofSeconds(10)).until(() -> { // the writer thread's pace
            flushClock.advanceMillis(1_000);
            return JournalReader.readAll(dir.resolve("plant.jsonl")).entries().stream().anyMatch(e -> e.kind().equals("truth"));
        });
        assertThat(JournalReader.readAll(dir.resolve("plant.jsonl")).summary().cutShort()).isTrue();

        p.close();
        JournalReader.Contents c = JournalReader.readAll(dir.resolve("plant.jsonl"));
        assertThat(c.summary().cutShort()).isFalse();
        assertThat(c.summary().endReason()).contains(EndReason.COMPLETED);
        assertThat(c.summary().tornTail()).isFalse();

        List<JournalEntry> truth = kind(c, "truth");
        // one entry per scenario second (the first at the first step, 0.02 s), up to the end at 10 s
        assertThat(truth).hasSize(11);
        JournalEntry last = truth.get(truth.size() - 1);
        assertThat(last.number("timeS").getAsDouble()).isEqualTo(10.0);
        assertThat(last.tMs()).isEqualTo(p.agent().epochMsAt(10));
        assertThat(last.fields().path("areas").path("north-basin").path("frequencyHz").asDouble())
                .isCloseTo(p.sim().frequencyHz("north-basin"), within(1e-6));
        assertThat(last.fields().path("ties").path("basin-ridge").path("flowMw").asDouble())
                .isCloseTo(p.sim().tieFlowMw("basin-ridge"), within(1e-3));
        assertThat(last.fields().path("units").path("basin-gas-1").path("controlMode").asText()).isEqualTo("local");
        assertThat(last.fields().path("units").path("basin-steam-1").path("online").asBoolean()).isTrue();

        List<JournalEntry> commands = kind(c, "command");
        assertThat(commands).hasSize(2);
        JournalEntry ok = commands.get(0);
        assertThat(ok.text("outcome")).isEqualTo("accepted");
        assertThat(ok.text("direction")).isEqualTo("raise");
        // 18 MW/min × 4 s = 1.2 MW (demo site's basin-steam-1 pulse rate)
        assertThat(ok.number("loadReferenceAfterMw").getAsDouble() - ok.number("loadReferenceBeforeMw").getAsDouble())
                .isCloseTo(1.2, within(1e-9));
        assertThat(commands.get(1).text("outcome")).isEqualTo("rejected");
        assertThat(commands.get(1).text("reason")).isEqualTo("expired");
        assertThat(commands.get(1).number("commandSeq").getAsDouble()).isEqualTo(2);

        List<JournalEntry> published = kind(c, "published");
        // meters every 2 s at t = 0, 2, …, 10 s for two areas
        assertThat(published.stream().filter(e -> "AreaMeter".equals(e.text("type")))).hasSize(12);
        assertThat(published).anyMatch(e -> "UnitTelemetry".equals(e.text("type")) && e.fields().path("sent").asBoolean()
                && e.fields().path("message").path("unit").asText().equals("ridge-hydro-2"));
        assertThat(published).anyMatch(e -> "CommandAck".equals(e.text("type")));
        assertThat(published).allMatch(e -> e.fields().path("seq").asLong() == e.fields().path("message").path("seq").asLong());

        assertThat(kind(c, "event")).anyMatch(e -> "loadStep".equals(e.text("event")) && "north-basin".equals(e.text("area"))
                && e.number("atS").getAsDouble() == 2.0);
        assertThat(kind(c, "event")).anyMatch(e -> "mode".equals(e.text("event")) && "basin-gas-1".equals(e.text("unit")));
        // an operator order (not a fault) is journaled as an event
        assertThat(kind(c, "event")).filteredOn(e -> "operatorOrder".equals(e.text("event"))).singleElement().satisfies(f -> {
            assertThat(f.text("orderId")).isEqualTo("order-1");
            assertThat(f.text("action")).isEqualTo("start");
        });
        if (journalQueue > 0) { // the queue's figures: nothing dropped
            assertThat(kind(c, "event")).filteredOn(e -> "journalQueue".equals(e.text("event"))).singleElement()
                    .satisfies(e -> assertThat(e.number("dropped").getAsDouble()).isZero());
        }
        assertThat(HistogramLogs.readTotals(dir.resolve("plant.hlog")).histograms())
                .containsKeys(PlantRunJournal.STEP_LATENESS_US, PlantRunJournal.COMMAND_TO_REFERENCE_US);
    }

    @Test
    void shouldEndAsStoppedWhenClosedBeforeTheScenarioEnds() throws Exception {
        PlantRunner p = plant();
        run(p, 2);
        p.close();
        JournalReader.Contents c = JournalReader.readAll(dir.resolve("plant.jsonl"));
        assertThat(c.summary().endReason()).contains(EndReason.STOPPED);
        assertThat(c.summary().header().orElseThrow().path("site").asText()).isEqualTo("demo-site");
    }

    private static List<JournalEntry> kind(JournalReader.Contents c, String kind) {
        return c.entries().stream().filter(e -> e.kind().equals(kind)).toList();
    }
}
