package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.stream.LongStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.RehearsalStudy;

/**
 * The meshed three-area 50 Hz tie-line-bias site with a 150 MW step in one area, whose only unit
 * must take it: with our controller, in lockstep on the study's virtual clock, for several load
 * noise seeds. Before the following check's fixes its only unit was excluded for good in some runs
 * (ACE left at tens of MW). {@code -Dloopstand.rehearsalSeeds=10} runs ten seeds (default 2).
 */
class ThreeAreaStepRehearsalTest {
    static final Path SITE = ShippedScenariosWithControllerTest.CONFIG.resolve("sites/three-area-50.yaml");
    static final Path SCENARIO = ShippedScenariosWithControllerTest.CONFIG.resolve("scenarios/three-area-50-step.yaml");

    static LongStream seeds() {
        return LongStream.rangeClosed(1, Long.getLong("loopstand.rehearsalSeeds", 2));
    }

    @ParameterizedTest
    @MethodSource("seeds")
    void shouldRecoverTheSteppedAreaWithoutExcludingItsOnlyUnit(long seed) throws Exception {
        Grid grid = SiteLoader.load(SITE);
        RunScenario file = RunScenarioLoader.load(SCENARIO, EventTypeRegistry.physics(), grid);
        RunScenario rs = new RunScenario(file.scenario().withSeed(seed), file.rateX(), file.faults(), file.checks());
        ShippedScenariosWithControllerTest.Run run = ShippedScenariosWithControllerTest.runOnce(SITE, rs);
        RehearsalStudy.Result r = run.result();
        StringBuilder all = new StringBuilder("seed " + seed + " (" + r.record().commands().size() + " commands):");
        r.outcomes().forEach(o -> all.append("\n  ").append(o));
        System.out.println(all);
        assertThat(r.outcomes()).as(all.toString()).allMatch(CheckOutcome::passed);
        assertThat(run.controller().lastOutcome().excludedUnits()).as(all.toString()).isEmpty();
        assertThat(run.controller().lastOutcome().notes()).noneMatch(n -> n.startsWith("noEligibleUnits"));
    }
}
