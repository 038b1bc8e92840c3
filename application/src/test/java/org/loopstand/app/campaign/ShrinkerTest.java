package org.loopstand.app.campaign;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.check.CheckOutcome;

/** Shrinking drops what the failure does not need and keeps what it does, in real lockstep runs. */
class ShrinkerTest {
    @TempDir
    Path dir;

    private static RunPlan.PlannedFault local(String id, String unit) {
        return new RunPlan.PlannedFault(id, "switchToLocal", unit, Map.of(), 0, 150);
    }

    @Test
    void shouldDropTheRedundantFaultAndKeepTheFailingCombination() throws Exception {
        Files.writeString(dir.resolve("short.yaml"), CampaignFiles.SHORT_SCENARIO);
        // every south unit in local control makes frequency-back fail; a 1 s delay of the north meter adds nothing to that
        RunPlan plan = new RunPlan(1, 77, List.of(
                local("campaign-1", "ridge-hydro-1"),
                local("campaign-2", "ridge-hydro-2"),
                new RunPlan.PlannedFault("campaign-3", "delay", "north-basin", Map.of("delayMs", 1000.0), 20, 120),
                local("campaign-4", "ridge-steam-1")), List.of());
        ScenarioFiles files = new ScenarioFiles(dir.resolve("short.yaml"), List.of("test"));
        Path first = dir.resolve("run-0001.yaml");
        files.write(plan, first, "the failing run");
        List<CheckOutcome> checks = RunExecutor.LOCKSTEP.checks(CampaignFiles.SITE, first);
        RunResult failing = new RunResult(plan, first, checks, null);
        assertThat(failing.failingChecks()).as("the run to shrink fails").contains("frequency-back");

        int maxSteps = 6;
        RunResult.Shrunk s = new Shrinker(RunExecutor.LOCKSTEP, CampaignFiles.SITE, files, new CampaignSpec.Shrink(1, maxSteps, 40))
                .shrink(failing, dir.resolve("shrunk"));

        assertThat(s.check()).isEqualTo("frequency-back");
        // dropping each local-control fault lets the unit left in remote take the 40 MW (3 runs pass); dropping the delay
        // keeps the failure (4th run); then the three local faults are dropped in turn again and each time it passes
        assertThat(s.steps()).hasSize(1);
        assertThat(s.steps().get(0)).startsWith("dropped delay on north-basin");
        assertThat(s.smallest().faults()).extracting(RunPlan.PlannedFault::target)
                .containsExactly("ridge-hydro-1", "ridge-hydro-2", "ridge-steam-1");
        assertThat(s.runsTried()).isEqualTo(maxSteps);
        assertThat(s.outcome().passed()).isFalse();
        assertThat(Files.readString(s.scenarioFile())).contains("switchToLocal").doesNotContain("delayMs");
        assertThat(dir.resolve("shrunk/run-0001-trying.yaml")).doesNotExist();
    }
}
