package org.loopstand.app.lockstep;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.check.CheckOutcome;

/**
 * The built-in controller takes an area up again right after a load step (what a start-up suspension on stale
 * data did in a real-time rehearsal of cluster-unit-trip.yaml): north-basin's meter is silent for the first
 * 24 s, the 80 MW load step comes at 30 s, the controller resumes at 32 s (three clear cycles of 4 s) while
 * the governors carry the step. Its first setpoints raise the units' load references a little; judged against
 * the units' outputs, which the governors had raised by some 40 MW, they looked like a 41 MW lowering.
 * Bumpless transfer: from memory, Åström and Hägglund, Advanced PID Control, 2006; a setpoint moves the load
 * reference, the governor's droop response comes on top (from memory: Kundur, Power System Stability and
 * Control, 1994, ch. 11).
 */
class ResumeAfterLoadStepLockstepTest {
    private static final String SCENARIO = """
            siteId: demo-site
            durationS: 60
            seed: 42
            startHourOfDay: 10.5
            events:
              - {atS: 30, type: loadStep, area: north-basin, deltaMw: 80}
            faults:
              - {id: nb-silent, type: blackout, target: north-basin, startS: 0, endS: 24}
            checks:
              - {name: no-bump, type: noBumpAfterResume, area: north-basin}
            """;

    @TempDir
    Path dir;

    @Test
    void shouldFindNoBumpWhenTheControllerResumesWhileTheGovernorsCarryALoadStep() throws Exception {
        Path scenario = Files.writeString(dir.resolve("resume-after-load-step.yaml"), SCENARIO);

        List<CheckOutcome> checks = new LockstepRehearsal(ShippedScenariosLockstepTest.CONFIG.resolve("sites/demo-site.yaml"),
                scenario, null).checksOnly();

        assertThat(checks).hasSize(1);
        CheckOutcome noBump = checks.get(0);
        // the resume judged is the one after the step: truth ACE about −120 MW calls for raising
        assertThat(noBump.detail()).contains("1 resume(s): controller-1 north-basin at 32.0 s after suspended [frequencyUnusable:north-basin");
        assertThat(noBump.decidingFigure()).isZero();
        assertThat(noBump.passed()).isTrue();
    }
}
