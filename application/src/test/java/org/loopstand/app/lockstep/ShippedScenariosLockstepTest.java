package org.loopstand.app.lockstep;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.app.rehearsal.Rehearsal;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.ReportModel;

/**
 * Every shipped scenario with checks, both ways: a real-time {@code rehearse} (plant and built-in controller
 * as processes over an embedded broker) and the lockstep run of {@code study --with-controller}. Each check
 * must come out the same in both (name → pass/fail), as docs/faults.md and docs/controller-trials.md say it
 * does, and the lockstep report built from its run folder must show what the study decided.
 *
 * <p>Left out, because they name no check and so leave nothing to compare: {@code pulse-test-morning.yaml}
 * (the quiet backdrop of the unit response test), {@code three-area-step.yaml} and {@code unit-trip.yaml}
 * (physics studies). A shipped scenario that names a check is covered without editing this test.
 *
 * <p>The rehearsals run {@link #AT_ONCE} at a time at rate {@link #RATE} while the test thread does the
 * lockstep runs (CI time: docs/campaigns.md, "Tests"). A verdict must not depend on the rate: where the
 * machine cannot keep it, the plant's pace keeper slows the scenario clock and the rehearsal says so.
 */
class ShippedScenariosLockstepTest {
    static final Path CONFIG = Path.of("..", "config");
    /** Scenario seconds per wall second of the real-time rehearsals. */
    static final double RATE = 40;
    /** Real-time rehearsals at the same time (two JVMs each). */
    static final int AT_ONCE = 4;

    /**
     * docs/faults.md, table of shipped scenarios, column "with our controller": every check passes but
     * {@code steam-2-refuses-expired}, whose unit acts on expired commands on purpose.
     */
    static final Set<String> DOCUMENTED_FAILING = Set.of("steam-2-refuses-expired");

    @TempDir
    static Path runs;

    static RealTimeRehearsals rehearsals;

    /** Every shipped scenario (config/scenarios/*.yaml) that names at least one check, by file name. */
    static Stream<String> shipped() throws IOException {
        List<String> withChecks = new ArrayList<>();
        try (Stream<Path> files = Files.list(CONFIG.resolve("scenarios"))) {
            for (Path f : files.filter(f -> f.toString().endsWith(".yaml")).sorted().toList()) {
                if (!load(f).checks().isEmpty()) {
                    withChecks.add(f.getFileName().toString());
                }
            }
        }
        return withChecks.stream();
    }

    static Path siteOf(Path scenario) {
        return CONFIG.resolve("sites/" + Rehearsal.scenarioSiteId(scenario) + ".yaml");
    }

    static RunScenario load(Path scenario) throws IOException {
        return RunScenarioLoader.load(scenario, EventTypeRegistry.physics(), SiteLoader.load(siteOf(scenario)));
    }

    @BeforeAll
    static void startTheRealTimeRehearsals() throws IOException {
        List<RealTimeRehearsals.Planned> planned = new ArrayList<>();
        for (String file : shipped().toList()) {
            Path scenario = CONFIG.resolve("scenarios/" + file);
            planned.add(new RealTimeRehearsals.Planned(scenario, siteOf(scenario), load(scenario).scenario().durationS()));
        }
        rehearsals = new RealTimeRehearsals(planned, RATE, AT_ONCE, Files.createDirectory(runs.resolve("real-time")));
    }

    @AfterAll
    static void stopWhatStillRuns() throws InterruptedException {
        if (rehearsals != null) {
            rehearsals.close();
        }
    }

    @ParameterizedTest
    @MethodSource("shipped")
    void shouldDecideEveryCheckAsTheRealTimeRehearsalDoesAndAsDocumented(String file) throws Exception {
        Path scenario = CONFIG.resolve("scenarios/" + file);
        Path run = Files.createDirectories(runs.resolve("lockstep").resolve(file.replace(".yaml", "")));
        LockstepRehearsal.Outcome lockstep = new LockstepRehearsal(siteOf(scenario), scenario, null).run(run);
        Map<String, Boolean> decided = new LinkedHashMap<>();
        lockstep.checks().forEach(c -> decided.put(c.name(), c.passed()));

        RealTimeRehearsals.Rehearsed real = rehearsals.await(scenario, 900);
        assertThat(real.outcome().message()).as(real.printed()).isNull();
        assertThat(JournalReader.readAll(real.outcome().runFolder().resolve("plant.jsonl")).summary().endReason())
                .as(real.printed()).contains(EndReason.COMPLETED);
        Map<String, Boolean> rehearsed = passed(real.report());
        assertThat(decided).as("lockstep %s%nagainst real time at rate %s:%n%s%n%s", lockstep.checks(), RATE,
                real.report().checks(), real.printed()).containsExactlyEntriesOf(rehearsed);

        Map<String, Boolean> documented = new LinkedHashMap<>();
        load(scenario).checks().forEach(c -> documented.put(c.name(), !DOCUMENTED_FAILING.contains(c.name())));
        assertThat(documented).as("the scenario names checks").isNotEmpty();
        assertThat(decided).as(lockstep.checks().toString()).containsExactlyEntriesOf(documented);
        // the report reads the checks back from plant.jsonl: the same names and outcomes, the verdict follows
        assertThat(passed(lockstep.report())).containsExactlyEntriesOf(documented);
        assertThat(lockstep.report().verdict()).isEqualTo(lockstep.checks().stream().allMatch(CheckOutcome::passed)
                ? ReportModel.Verdict.PASS : ReportModel.Verdict.FAIL);
    }

    private static Map<String, Boolean> passed(ReportModel report) {
        Map<String, Boolean> m = new LinkedHashMap<>();
        for (CheckResult c : report.checks()) {
            m.put(c.name(), c.passed());
        }
        return m;
    }
}
