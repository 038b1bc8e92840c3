package org.loopstand.plant.study;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.withinPercentage;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.site.SiteLoader;

/**
 * Every shipped rehearsal scenario in study mode on the physics alone (the plant agent and a
 * controller are not plugged in yet): the outcomes must match the "physics only" column of
 * docs/faults.md. Without secondary control frequency, tie flow and ACE stay off schedule, and no
 * command ever arrives, so command checks have nothing to judge.
 */
class ShippedScenariosStudyTest {
    private static final Path CONFIG = Path.of("..", "config");

    static RehearsalStudy.Result run(String file) throws Exception {
        Grid grid = SiteLoader.load(CONFIG.resolve("sites/demo-site.yaml"));
        RunScenario rs = RunScenarioLoader.load(CONFIG.resolve("scenarios/" + file), EventTypeRegistry.physics(), grid);
        return new RehearsalStudy(grid, rs, 1.0, c -> List.of(), FaultObserver.NONE).run();
    }

    private static Map<String, Boolean> expect(Object... nameAndPass) {
        Map<String, Boolean> m = new LinkedHashMap<>();
        for (int i = 0; i < nameAndPass.length; i += 2) {
            m.put((String) nameAndPass[i], (Boolean) nameAndPass[i + 1]);
        }
        return m;
    }

    static Stream<Arguments> physicsOnly() {
        return Stream.of(
                Arguments.of("rehearse-unit-trip.yaml", expect("frequency-back", false, "tie-back", false, "ace-recovered", false)),
                Arguments.of("rehearse-meter-freeze.yaml", expect("no-pulse-on-frozen-meter", true, "controller-suspends", false,
                        "frequency-back", false)),
                Arguments.of("rehearse-tie-sign-flip.yaml", expect("controller-suspends", false, "tie-held", true)),
                Arguments.of("rehearse-telemetry-loss.yaml", expect("frequency-back", false, "ace-recovered", false)),
                Arguments.of("rehearse-broker-outage.yaml", expect("no-pulse-while-blind", true, "frequency-back", false)),
                Arguments.of("rehearse-pulses-expired.yaml", expect("steam-1-refuses-expired", false, "steam-2-refuses-expired", false)),
                Arguments.of("rehearse-unit-not-following.yaml", expect("frequency-back", false, "ace-recovered", false)),
                Arguments.of("rehearse-noisy-day.yaml", expect("north-ace-recovered", true, "south-frequency-held", true)));
    }

    @ParameterizedTest
    @MethodSource("physicsOnly")
    void shouldComeOutAsDocumentedOnThePhysicsAlone(String file, Map<String, Boolean> expected) throws Exception {
        RehearsalStudy.Result r = run(file);
        assertThat(r.outcomes()).extracting(CheckOutcome::name).containsExactlyElementsOf(expected.keySet());
        for (CheckOutcome o : r.outcomes()) {
            assertThat(o.passed()).as(file + ": " + o).isEqualTo(expected.get(o.name()));
        }
    }

    @Test
    void shouldLeaveTheTripOffsetThatPrimaryControlAloneGives() throws Exception {
        // Kundur, Power System Stability and Control, ch. 11; Saadat, ch. 12 (from memory): Δf_ss = −ΔP / (D + Σ 1/R), re-derived for the demo site
        // after losing ridge-hydro-2 (260 MW, its 1/R = 400/(0.05·50) = 160 MW/Hz gone):
        // D = 34 + 22, Σ 1/R = 360 + 320 + 240 + 200 + 350 → β = 1526 MW/Hz. The two basin steam units have a
        // 10 mHz dead band, which withholds 0.01 Hz × 680 MW/Hz = 6.8 MW: Δf = −(260 + 6.8)/1526 = −0.1748 Hz.
        RehearsalStudy.Result r = run("rehearse-unit-trip.yaml");
        RunRecord.Series f = r.record().series("frequencyHz/south-ridge");
        double sum = 0;
        int n = 0;
        for (int i = 0; i < f.size(); i++) {
            if (f.timeS(i) >= 1000) {
                sum += f.value(i) - 50;
                n++;
            }
        }
        // 2 %: the loads' noise (σ 6 and 4 MW) moves the mean of 200 one-second samples by well under 1 mHz
        assertThat(sum / n).isCloseTo(-0.1748, withinPercentage(2));
    }
}
