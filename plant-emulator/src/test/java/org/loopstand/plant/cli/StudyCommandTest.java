package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class StudyCommandTest {
    @TempDir
    Path tmp;

    @Test
    void shouldRunAScenarioGivenAloneWithTheSiteItNamesFoundBesideIt() throws Exception {
        // README: "Without --with-controller, study runs the physics alone": study SCENARIO as with the controller
        Files.copy(Path.of("..", "config", "sites", "demo-site.yaml"), tmp.resolve("demo-site.yaml"));
        Path scenario = Files.writeString(tmp.resolve("step.yaml"),
                "siteId: demo-site\ndurationS: 20\nseed: 3\nstartHourOfDay: 10\nevents:\n  - {atS: 5, type: loadStep, area: north-basin, deltaMw: 80}\n");
        Path out = tmp.resolve("out");

        int code = new CommandLine(new PlantCli()).execute("study", scenario.toString(), "--out", out.toString());

        assertThat(code).isZero();
        assertThat(Files.readString(out.resolve("summary.json"))).contains("\"siteId\": \"demo-site\"", "\"simulatedSeconds\": 20");
    }

    @Test
    void shouldRefuseAStudyWithoutAScenarioWithExitTwo() {
        assertThat(new CommandLine(new PlantCli()).execute("study", "--out", tmp.resolve("o").toString())).isEqualTo(2);
    }

    @Test
    void shouldNameTheDefaultOutputFolderAfterTheScenario() {
        // 2026-12-03T21:55:05Z; the stamp is in local time, as the rehearsal's run folders
        Path p = StudyCommand.defaultOut(Path.of("x", "tarnwick-step-trip.yaml"), 1_796_334_905_000L);
        assertThat(p.getParent()).isEqualTo(Path.of("runs"));
        assertThat(p.getFileName().toString()).matches("\\d{8}-\\d{6}-tarnwick-step-trip-study");
    }
}
