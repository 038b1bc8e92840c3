package org.loopstand.plant.study;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.time.VirtualClock;

/**
 * One scenario format for every run: the physics-only study takes every shipped scenario file, the
 * rehearsal ones included, and decides their checks exactly as the lockstep run on the physics alone.
 */
class OneScenarioFormatTest {
    private static final Path CONFIG = Path.of("..", "config");
    /** Shipped scenarios with network faults between named hosts: only the plant with its --hosts file runs them. */
    private static final java.util.Set<String> NEEDS_HOSTS = java.util.Set.of("cross-host-partition.yaml");

    static Stream<String> shippedScenarios() throws Exception {
        try (Stream<Path> files = Files.list(CONFIG.resolve("scenarios"))) {
            return files.map(f -> f.getFileName().toString()).filter(n -> n.endsWith(".yaml")).sorted().toList().stream();
        }
    }

    private static Grid siteOf(Path scenario) throws Exception {
        String site = YamlNode.topLevelText(scenario, "siteId").orElseThrow();
        return SiteLoader.load(CONFIG.resolve("sites/" + site + ".yaml"));
    }

    @ParameterizedTest
    @MethodSource("shippedScenarios")
    void shouldStudyEveryShippedScenario(String file) throws Exception {
        Path path = CONFIG.resolve("scenarios/" + file);
        Grid grid = siteOf(path);
        if (NEEDS_HOSTS.contains(file)) {
            // a network fault between hosts has no meaning without the hosts: refused at its line, not skipped
            assertThatThrownBy(() -> RunScenarioLoader.load(path, EventTypeRegistry.physics(), grid))
                    .hasMessageContaining(file + ":").hasMessageContaining("unknown host")
                    .hasMessageContaining("give the plant --hosts FILE");
            return;
        }
        RunScenario rs = RunScenarioLoader.load(path, EventTypeRegistry.physics(), grid);
        // cut to 30 s: acceptance and a run through the engine are what is checked here, not the outcomes
        RunScenario shortRun = new RunScenario(rs.scenario().withDurationS(Math.min(30, rs.scenario().durationS())),
                rs.rateX(), List.of(), List.of());
        StudyResult r = new StudyRunner(grid, shortRun, new VirtualClock(0), ProgressReporter.NONE).run(new StringWriter());
        assertThat(r.simulatedSeconds()).isCloseTo(Math.min(30, rs.scenario().durationS()), org.assertj.core.data.Offset.offset(1e-6));
    }

    @ParameterizedTest
    @MethodSource("rehearsals")
    void shouldDecideTheSameChecksInTheStudyAsInTheLockstepRunOnThePhysicsAlone(String file) throws Exception {
        Grid grid = SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
        RunScenario rs = RunScenarioLoader.load(CONFIG.resolve("scenarios/" + file), EventTypeRegistry.physics(), grid);
        List<CheckOutcome> lockstep = new RehearsalStudy(grid, rs, 1.0, c -> List.of(), FaultObserver.NONE).run().outcomes();
        StudyRunner study = new StudyRunner(grid, rs, new VirtualClock(0), ProgressReporter.NONE);
        study.run(new StringWriter());
        assertThat(study.checkOutcomes()).isNotEmpty();
        assertThat(study.checkOutcomes()).extracting(CheckOutcome::name, CheckOutcome::passed)
                .containsExactlyElementsOf(lockstep.stream()
                        .map(o -> org.assertj.core.groups.Tuple.tuple(o.name(), o.passed())).toList());
        assertThat(study.checkOutcomes()).extracting(CheckOutcome::toString)
                .containsExactlyElementsOf(lockstep.stream().map(CheckOutcome::toString).toList());
    }

    static Stream<String> rehearsals() {
        return Stream.of("rehearse-unit-trip.yaml", "rehearse-meter-freeze.yaml", "rehearse-noisy-day.yaml");
    }

    @Test
    void shouldKeepAPlainPhysicsScenarioFreeOfChecks() throws Exception {
        Grid grid = SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
        RunScenario rs = RunScenarioLoader.load(CONFIG.resolve("scenarios/unit-trip.yaml"), EventTypeRegistry.physics(), grid);
        StudyRunner study = new StudyRunner(grid, new RunScenario(rs.scenario().withDurationS(20), 1.0, rs.faults(), rs.checks()),
                new VirtualClock(0), ProgressReporter.NONE);
        study.run(new StringWriter());
        assertThat(study.checkOutcomes()).isEmpty();
    }
}
