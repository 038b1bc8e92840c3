package org.loopstand.app.lockstep;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.io.CleanupMode;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalReader;

/**
 * Every shipped scenario with checks ({@link ShippedScenariosLockstepTest#shipped()}, the same ones left
 * out), both ways: a real-time {@code rehearse} (plant and built-in controller as processes over an
 * embedded broker) and the lockstep run of {@code study --with-controller}. Each check must come out the
 * same in both, name → pass/fail.
 *
 * <p>The rehearsals run {@link #AT_ONCE} at a time (system property {@code realtime.parallel} to change it, e.g.
 * {@code -Drealtime.parallel=1} for one at a time) at rate {@link #RATE} while the test thread does the lockstep
 * runs. Minutes of wall time on a 2-core machine (docs/performance.md, "Lockstep against real time"), so it is tagged
 * {@code realtime-comparison} and kept out of the normal build:
 * {@code ./mvnw -pl application -am test -Dtest=ShippedScenariosRealTimeTest -Drealtime.excludedGroups=none
 * -Dsurefire.failIfNoSpecifiedTests=false}. A verdict must not depend on the rate; where the machine cannot
 * keep it the plant says RATE NOT KEPT, and the test prints that line per rehearsal. On a loaded machine two
 * real-time verdicts have differed from the lockstep's (docs/performance.md, "Lockstep against real time"):
 * that is what this test is for, and its comparison stays strict.
 */
@Tag("realtime-comparison")
class ShippedScenariosRealTimeTest {
    /** Scenario seconds per wall second of the real-time rehearsals. */
    static final double RATE = 40;
    /** Real-time rehearsals at the same time (two JVMs each), unless {@code -Drealtime.parallel=N} says otherwise. */
    static final int AT_ONCE = 4;

    /** @return how many rehearsals run at once: {@code realtime.parallel} when set, else {@link #AT_ONCE} */
    static int atOnce() {
        String v = System.getProperty("realtime.parallel", "").trim();
        if (v.isEmpty()) {
            return AT_ONCE;
        }
        try {
            int n = Integer.parseInt(v);
            if (n >= 1) {
                return n;
            }
        } catch (NumberFormatException e) {
            // falls through to the message below
        }
        throw new IllegalArgumentException("realtime.parallel must be a whole number ≥ 1, got '" + v + "'");
    }

    /** Kept when a comparison fails, so the differing run's journals can be read (the failure message names its folder). */
    @TempDir(cleanup = CleanupMode.ON_SUCCESS)
    static Path runs;

    static RealTimeRehearsals rehearsals;

    @BeforeAll
    static void startTheRealTimeRehearsals() throws IOException {
        List<RealTimeRehearsals.Planned> planned = new ArrayList<>();
        for (String file : ShippedScenariosLockstepTest.shipped().toList()) {
            Path scenario = ShippedScenariosLockstepTest.CONFIG.resolve("scenarios/" + file);
            planned.add(new RealTimeRehearsals.Planned(scenario, ShippedScenariosLockstepTest.siteOf(scenario),
                    ShippedScenariosLockstepTest.load(scenario).scenario().durationS()));
        }
        rehearsals = new RealTimeRehearsals(planned, RATE, atOnce(), Files.createDirectory(runs.resolve("real-time")));
    }

    @AfterAll
    static void stopWhatStillRuns() throws InterruptedException {
        if (rehearsals != null) {
            rehearsals.close();
        }
    }

    @ParameterizedTest
    @MethodSource("org.loopstand.app.lockstep.ShippedScenariosLockstepTest#shipped")
    void shouldDecideEveryCheckAsTheRealTimeRehearsalDoes(String file) throws Exception {
        Path scenario = ShippedScenariosLockstepTest.CONFIG.resolve("scenarios/" + file);
        Path run = Files.createDirectories(runs.resolve("lockstep").resolve(file.replace(".yaml", "")));
        LockstepRehearsal.Outcome lockstep = new LockstepRehearsal(ShippedScenariosLockstepTest.siteOf(scenario), scenario, null)
                .run(run);

        RealTimeRehearsals.Rehearsed real = rehearsals.await(scenario, 1800);
        assertThat(real.outcome().message()).as(real.printed()).isNull();
        assertThat(JournalReader.readAll(real.outcome().runFolder().resolve("plant.jsonl")).summary().endReason())
                .as(real.printed()).contains(EndReason.COMPLETED);
        assertThat(real.report()).as(real.printed()).isNotNull();
        // both sides' figures in the message: a changed verdict is a finding to explain, not to loosen
        assertThat(ShippedScenariosLockstepTest.passed(lockstep.checks()))
                .as("lockstep %s%nagainst real time at rate %s:%n%s%n%s", lockstep.checks(), RATE, real.report().checks(), real.printed())
                .isNotEmpty().containsExactlyEntriesOf(ShippedScenariosLockstepTest.passed(real.report()));
    }
}
