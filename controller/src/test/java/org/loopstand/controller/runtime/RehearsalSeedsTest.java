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
 * Rehearsals of the controller's failure cases with our controller, in lockstep on the study's
 * virtual clock, over several load-noise seeds ({@code -Dloopstand.rehearsalSeeds=10} runs ten;
 * default 2). In lockstep the replay rate does not enter: scenario time is the only time.
 */
class RehearsalSeedsTest {
    static final Path CONFIG = ShippedScenariosWithControllerTest.CONFIG;

    static LongStream seeds() {
        return LongStream.rangeClosed(1, Long.getLong("loopstand.rehearsalSeeds", 2));
    }

    private static ShippedScenariosWithControllerTest.Run run(String site, String scenario, long seed) throws Exception {
        Path sitePath = CONFIG.resolve("sites/" + site);
        Grid grid = SiteLoader.load(sitePath);
        RunScenario file = RunScenarioLoader.load(CONFIG.resolve("scenarios/" + scenario), EventTypeRegistry.physics(), grid);
        RunScenario rs = new RunScenario(file.scenario().withSeed(seed), file.rateX(), file.faults(), file.checks());
        return ShippedScenariosWithControllerTest.runOnce(sitePath, rs);
    }

    private static String describe(String scenario, long seed, RehearsalStudy.Result r) {
        StringBuilder all = new StringBuilder(scenario + " seed " + seed + " (" + r.record().commands().size()
                + " commands):");
        r.outcomes().forEach(o -> all.append("\n  ").append(o));
        System.out.println(all);
        return all.toString();
    }

    /**
     * The meshed three-area 50 Hz tie-line-bias site, a 150 MW step in an area whose only unit must
     * take it. Before the following check's fixes that unit could be excluded for good.
     */
    @ParameterizedTest
    @MethodSource("seeds")
    void shouldRecoverTheSteppedAreaWithoutExcludingItsOnlyUnit(long seed) throws Exception {
        ShippedScenariosWithControllerTest.Run run = run("three-area-50.yaml", "three-area-50-step.yaml", seed);
        RehearsalStudy.Result r = run.result();
        String all = describe("three-area-50-step", seed, r);
        assertThat(r.outcomes()).as(all).isNotEmpty().allMatch(CheckOutcome::passed);
        assertThat(run.controller().lastOutcome().excludedUnits()).as(all).isEmpty();
        assertThat(run.controller().lastOutcome().notes()).noneMatch(n -> n.startsWith("noEligibleUnits"));
    }

    /** The demo site's north frequency alone holding its last value during a load step. */
    @ParameterizedTest
    @MethodSource("seeds")
    void shouldSuspendOnAHeldFrequencyAndSendNothingOnTheFalseAce(long seed) throws Exception {
        RehearsalStudy.Result r = run("demo-site.yaml", "rehearse-frequency-hold.yaml", seed).result();
        String all = describe("rehearse-frequency-hold", seed, r);
        assertThat(r.outcomes()).as(all).isNotEmpty().allMatch(CheckOutcome::passed);
        // the north alone suspended within 26 s of the hold (12 equal readings at a 2 s scan + one 4 s cycle)
        assertThat(r.record().statuses()).as(all)
                .anyMatch(st -> st.receivedS() >= 140 && st.receivedS() <= 166
                        && st.status().suspendedAreas() != null
                        && st.status().suspendedAreas().stream().anyMatch(a -> a.area().equals("north-basin")
                                && a.reasons().contains("frequencyUnusable:north-basin")));
    }

    /**
     * Four units with quadratic costs, one at its upper and one at its lower limit in the dispatch, no
     * disturbance: tertiary re-dispatch must walk the base points onto the economic dispatch of the
     * eligible units while the frequency stays within ±50 mHz (the scenario's check).
     */
    @ParameterizedTest
    @MethodSource("seeds")
    void shouldWalkTheBasePointsOntoTheEconomicDispatch(long seed) throws Exception {
        ShippedScenariosWithControllerTest.Run run = run("four-unit-dispatch.yaml", "four-unit-redispatch.yaml", seed);
        RehearsalStudy.Result r = run.result();
        String all = describe("four-unit-redispatch", seed, r);
        java.util.Map<String, Double> base = run.controller().cycle().basePointsMw("fern-vale");
        System.out.println("base points " + base + ", notes " + run.controller().lastOutcome().notes());
        assertThat(r.outcomes()).as(all).isNotEmpty().allMatch(CheckOutcome::passed);
        // the dispatch at 900 MW, re-derived by hand: hydro at its 300 MW maximum, gas at its 100 MW
        // minimum, the steam units at equal incremental cost λ = (500 + 7.5·250 + 7.8·200)/450 = 8.744:
        // 311.1 and 188.9 MW. The load noise (3 MW) moves the demand a little: within 10 MW.
        assertThat(base.get("fern-hydro-1")).as(all).isCloseTo(300, org.assertj.core.api.Assertions.within(1.0));
        assertThat(base.get("fern-gas-1")).as(all).isCloseTo(100, org.assertj.core.api.Assertions.within(1.0));
        assertThat(base.get("fern-steam-1")).as(all).isCloseTo(311.1, org.assertj.core.api.Assertions.within(10.0));
        assertThat(base.get("fern-steam-2")).as(all).isCloseTo(188.9, org.assertj.core.api.Assertions.within(10.0));
        assertThat(run.controller().lastOutcome().excludedUnits()).as(all).isEmpty();
    }
}
