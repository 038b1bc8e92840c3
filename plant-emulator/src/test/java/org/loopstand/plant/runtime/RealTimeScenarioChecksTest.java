package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.RehearsalStudy;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.time.VirtualClock;

/**
 * The real-time plant loop, the lockstep run and (through it) the physics-only study step one scenario
 * with the same engine: with no controller on the bus, the plant's checks come out exactly as the
 * lockstep run's on the physics alone.
 */
class RealTimeScenarioChecksTest {
    private static final Path CONFIG = Path.of("..", "config");

    @Test
    void shouldDecideTheSameChecksInRealTimeAsInLockstep() throws Exception {
        Grid grid = SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
        RunScenario full = RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-unit-trip.yaml"), EventTypeRegistry.physics(),
                grid);
        RunScenario rs = new RunScenario(full.scenario().withDurationS(300), full.rateX(), full.faults(), full.checks());
        List<String> lockstep = new RehearsalStudy(grid, rs, 1.0, c -> List.of(), FaultObserver.NONE).run().outcomes().stream()
                .map(o -> "plant: check " + o).toList();

        VirtualClock clock = new VirtualClock(RehearsalStudy.START_EPOCH_MS);
        var s = rs.scenario();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), s.seed(), s.startHourOfDay());
        // every unit runs "elsewhere" (nobody answers): the plant publishes field readings but touches no unit
        Set<String> remote = Set.copyOf(grid.units().stream().map(u -> u.id()).toList());
        PlantOptions o = new PlantOptions(1.0, remote, ConnectionGrouping.PER_UNIT, 1,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")), InterfaceOptions.defaults()
                        .withTelemetryScanMs(2_000, Map.of()), Qos.AT_MOST_ONCE, 256, s.seed(), 1e9);
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        List<String> realTime = new ArrayList<>();
        try (PlantRunner plant = new PlantRunner(sim, s.events(), o, broker::connect, clock, w -> { })) {
            plant.agent().checkWith(new RunRecord(RehearsalStudy.START_EPOCH_MS), rs.checks(), realTime::add);
            plant.agent().endAt(s.durationS());
            int cycles = 0;
            while (!plant.agent().finished()) {
                clock.advanceMillis(70); // a loop period that is no multiple of the step
                plant.agent().doWork();
                cycles++;
            }
            plant.agent().onClose();
            // the step after the last is due at 300 s + one step; the first cycle at or after it finds the end
            long stepNanos = Math.round(sim.stepS() * 1e9);
            long endDueNanos = (Math.round(300 / sim.stepS()) + 1) * stepNanos;
            assertThat(cycles).isEqualTo((endDueNanos + 70_000_000L - 1) / 70_000_000L);
            assertThat(sim.timeS()).isCloseTo(300.0, org.assertj.core.data.Offset.offset(1e-6));
        }
        assertThat(realTime).hasSize(rs.checks().size()).isEqualTo(lockstep);
        assertThat(realTime).allMatch(l -> l.startsWith("plant: check FAIL")); // no secondary control: nothing recovers
    }

    @Test
    void shouldJournalWhyNoCheckIsDecidedWhenTheRunStopsBeforeTheScenariosEnd(@TempDir Path dir) throws Exception {
        Grid grid = SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
        RunScenario rs = RunScenarioLoader.load(CONFIG.resolve("scenarios/rehearse-unit-trip.yaml"), EventTypeRegistry.physics(),
                grid);
        VirtualClock clock = new VirtualClock(RehearsalStudy.START_EPOCH_MS);
        var s = rs.scenario();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), s.seed(), s.startHourOfDay());
        PlantOptions o = new PlantOptions(1.0, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")), InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, 256, s.seed(), 1e9);
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        List<String> lines = new ArrayList<>();
        try (PlantRunner plant = new PlantRunner(sim, s.events(), o, broker::connect, clock, w -> { })) {
            plant.journalTo(PlantRunJournal.create(dir, plant.agent().epochMsAt(0), Map.of("site", "demo-site"), clock, clock),
                    1.0);
            plant.agent().checkWith(new RunRecord(RehearsalStudy.START_EPOCH_MS), rs.checks(), lines::add);
            plant.agent().endAt(s.durationS());
            while (sim.timeS() < 100) { // stopped from outside (a wall-time cap) at 100 s of the scenario's 900 s
                clock.advanceMillis(100);
                plant.agent().doWork();
            }
            plant.agent().onClose();
        }
        assertThat(s.durationS()).isGreaterThan(100);
        assertThat(lines).singleElement().asString().startsWith("plant: scenario checks not decided: the run stopped at 100.")
                .endsWith(" s, before its end");
        List<JournalEntry> notDecided = JournalReader.readAll(dir.resolve("plant.jsonl")).entries().stream()
                .filter(e -> "checksNotDecided".equals(e.text("event"))).toList();
        assertThat(notDecided).singleElement().satisfies(e -> {
            assertThat(e.text("reason")).isEqualTo("stoppedBeforeEnd");
            assertThat(e.get("stoppedAtS").asDouble()).isCloseTo(100.0, org.assertj.core.data.Offset.offset(0.2));
            assertThat(e.get("checks")).hasSize(rs.checks().size());
            assertThat(e.get("checks").get(0).asText()).isEqualTo(rs.checks().get(0).name());
        });
        assertThat(JournalReader.readAll(dir.resolve("plant.jsonl")).entries()).noneMatch(e -> e.kind().equals("check"));
    }
}
