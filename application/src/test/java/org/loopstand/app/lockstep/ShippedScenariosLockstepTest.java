package org.loopstand.app.lockstep;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.stream.Stream;

import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.ReportModel;

/**
 * Every shipped rehearsal scenario through the lockstep run: the checks come out as the "with our
 * controller" column of docs/faults.md says (the outcomes real-time rehearsals give, docs/controller-trials.md),
 * and the report built from the run folder's journals shows the same outcomes as the study decided.
 */
class ShippedScenariosLockstepTest {
    static final Path CONFIG = Path.of("..", "config");

    @TempDir
    Path runs;

    private static Map<String, Boolean> expect(Object... nameAndPass) {
        Map<String, Boolean> m = new LinkedHashMap<>();
        for (int i = 0; i < nameAndPass.length; i += 2) {
            m.put((String) nameAndPass[i], (Boolean) nameAndPass[i + 1]);
        }
        return m;
    }

    /** From docs/faults.md, the table of shipped scenarios, column "with our controller". */
    static Stream<Arguments> documented() {
        return Stream.of(
                Arguments.of("rehearse-unit-trip.yaml", expect("frequency-back", true, "tie-back", true, "ace-recovered", true)),
                Arguments.of("rehearse-meter-freeze.yaml", expect("no-pulse-on-frozen-meter", true, "controller-suspends", true,
                        "frequency-back", true)),
                Arguments.of("rehearse-frequency-hold.yaml", expect("no-pulse-on-held-frequency", true,
                        "controller-suspends", true, "frequency-back", true)),
                Arguments.of("rehearse-tie-sign-flip.yaml", expect("controller-suspends", true, "tie-held", true)),
                Arguments.of("rehearse-telemetry-loss.yaml", expect("frequency-back", true, "ace-recovered", true)),
                Arguments.of("rehearse-broker-outage.yaml", expect("no-pulse-while-blind", true, "frequency-back", true)),
                Arguments.of("rehearse-pulses-expired.yaml", expect("steam-1-refuses-expired", true, "steam-2-refuses-expired", false)),
                Arguments.of("rehearse-unit-not-following.yaml", expect("frequency-back", true, "ace-recovered", true)),
                Arguments.of("rehearse-noisy-day.yaml", expect("north-ace-recovered", true, "south-frequency-held", true)));
    }

    @ParameterizedTest
    @MethodSource("documented")
    void shouldComeOutAsDocumentedAndReportWhatTheStudyDecided(String file, Map<String, Boolean> expected) throws Exception {
        Path run = Files.createDirectory(runs.resolve(file.replace(".yaml", "")));
        LockstepRehearsal.Outcome o = new LockstepRehearsal(CONFIG.resolve("sites/demo-site.yaml"),
                CONFIG.resolve("scenarios/" + file), null).run(run);

        Map<String, Boolean> decided = new LinkedHashMap<>();
        o.checks().forEach(c -> decided.put(c.name(), c.passed()));
        assertThat(decided).as(o.checks().toString()).containsExactlyEntriesOf(expected);
        // the report reads the checks back from plant.jsonl: the same names and outcomes, the verdict follows
        Map<String, Boolean> reported = new LinkedHashMap<>();
        for (CheckResult c : o.report().checks()) {
            reported.put(c.name(), c.passed());
        }
        assertThat(reported).containsExactlyEntriesOf(expected);
        assertThat(o.report().verdict()).isEqualTo(o.checks().stream().allMatch(CheckOutcome::passed)
                ? ReportModel.Verdict.PASS : ReportModel.Verdict.FAIL);
    }
}
