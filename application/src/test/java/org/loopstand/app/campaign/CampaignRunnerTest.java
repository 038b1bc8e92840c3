package org.loopstand.app.campaign;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.app.lockstep.LockstepStudyCommand;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.protocol.time.VirtualClock;
import picocli.CommandLine;

/**
 * A small campaign end to end: real lockstep runs with the built-in controller on two workers, the
 * report with its failing run, and the reproduce command giving the same failure; a run that throws is
 * recorded with its stack trace while the others go on.
 */
class CampaignRunnerTest {
    /** Names the campaign folder only (2026-03-01T10:00:00Z). */
    static final long WALL_MS = 1_772_359_200_000L;

    @TempDir
    Path dir;

    private static PrintStream into(ByteArrayOutputStream buf) {
        return new PrintStream(buf, true, StandardCharsets.UTF_8);
    }

    @Test
    void shouldReportTheFailingRunAndItsReproduceCommandGivesTheSameFailure() throws Exception {
        // two runs: run 1 puts the three south units in local control for the whole run (nothing left for secondary
        // control to move), run 2 one unit only; the two others take the 40 MW
        Path file = CampaignFiles.campaign(dir, "local.yaml", """
                runs: 2
                masterSeed: 8
                faultsPerRun: {min: 1, max: 3}
                faults:
                  - type: switchToLocal
                    targets: [ridge-hydro-1, ridge-hydro-2, ridge-steam-1]
                    startS: {min: 0, max: 5}
                    durationS: {min: 140, max: 145}
                shrink: {maxRuns: 0}
                """);
        CampaignSpec spec = CampaignReader.read(file, dir);
        List<RunPlan> plans = CampaignExpander.of(spec).expand();
        assertThat(plans).extracting(p -> p.faults().size()).as("the draws this test is written for").containsExactly(3, 1);
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream out = into(buf);
        int code = new CommandLine(new CampaignCommand(out, out, new VirtualClock(WALL_MS), RunExecutor.LOCKSTEP))
                .execute(file.toString(), "--runs-dir", dir.resolve("runs").toString(), "--workers", "2");
        String text = buf.toString(StandardCharsets.UTF_8);

        assertThat(code).as(text).isEqualTo(1);
        assertThat(text).contains("campaign: 2/2 runs done, 1 failing, 0 errors", "campaign: 1 passed, 1 failed, 0 errors in 2 runs",
                "check frequency-back", "passed in 1 of 2 runs");
        Path folder;
        try (Stream<Path> s = Files.list(dir.resolve("runs"))) {
            folder = s.findFirst().orElseThrow();
        }
        String html = Files.readString(folder.resolve("report.html"));
        assertThat(html).contains("Failing runs (1)", "switchToLocal", "<svg", "Pass rate per check", "50 %");
        String json = Files.readString(folder.resolve("campaign.json"));
        assertThat(json).contains("\"failed\" : 1", "\"status\" : \"FAIL\"", "\"status\" : \"PASS\"");
        assertThat(Files.readAllLines(folder.resolve("runs.csv"))).hasSize(3).anySatisfy(l -> assertThat(l).startsWith("1,"
                + plans.get(0).seed() + ",FAIL,frequency-back ace-recovered,"));

        String reproduce = text.lines().filter(l -> l.startsWith("  run 1 FAIL")).findFirst().orElseThrow(() -> new AssertionError(text));
        String[] words = reproduce.substring(reproduce.indexOf("./loopstand study ") + "./loopstand study ".length()).split(" ");
        List<String> args = new ArrayList<>(Arrays.asList(words));
        args.addAll(List.of("--runs-dir", dir.resolve("again").toString()));
        ByteArrayOutputStream again = new ByteArrayOutputStream();
        int againCode = new CommandLine(new LockstepStudyCommand(into(again), into(again), new VirtualClock(WALL_MS)))
                .execute(args.toArray(String[]::new));
        String againText = again.toString(StandardCharsets.UTF_8);

        assertThat(againCode).as(againText).isEqualTo(1);
        assertThat(againText).contains("check FAIL frequency-back", "check FAIL ace-recovered", "verdict: FAIL");
        // the same outcome, figure and detail as in the campaign: the same run, not merely another failing one
        var runOne = new com.fasterxml.jackson.databind.ObjectMapper().readTree(json).get("runResults").get(0);
        String outcome = runOne.get("checks").get(0).asText();
        assertThat(outcome).startsWith("FAIL frequency-back: ");
        assertThat(againText).contains("check " + outcome);
    }

    @Test
    void shouldGiveTheSameOutcomesOnOneWorkerAndOnTwo() throws Exception {
        // runs on two threads at once share nothing: each run's outcomes, figures included, are those it gives alone
        Path file = CampaignFiles.campaign(dir, "workers.yaml", """
                runs: 4
                masterSeed: 21
                faultsPerRun: {min: 1, max: 2}
                faults:
                  - type: commandDelay
                    targets: [ridge-hydro-1, ridge-steam-1]
                    startS: {min: 0, max: 40}
                    durationS: {min: 40, max: 100}
                    parameters: {delayMs: {min: 3000, max: 12000}}
                  - type: switchToLocal
                    targets: [ridge-hydro-1, ridge-hydro-2]
                    startS: {min: 0, max: 40}
                    durationS: {min: 40, max: 100}
                loadEventsPerRun: 1
                loadEvents:
                  - {type: loadStep, areas: [south-ridge], atS: {min: 20, max: 60}, deltaMw: {min: -30, max: 30}}
                """);
        CampaignSpec spec = CampaignReader.read(file, dir);
        List<RunPlan> plans = CampaignExpander.of(spec).expand();
        VirtualClock wall = new VirtualClock(WALL_MS);

        CampaignRunner.Result one = new CampaignRunner(spec, plans, RunExecutor.LOCKSTEP, 1, wall, l -> { })
                .run(Files.createDirectories(dir.resolve("one")), false);
        CampaignRunner.Result two = new CampaignRunner(spec, plans, RunExecutor.LOCKSTEP, 2, wall, l -> { })
                .run(Files.createDirectories(dir.resolve("two")), false);

        assertThat(one.runs()).extracting(RunResult::status).doesNotContain(RunResult.Status.ERROR);
        assertThat(two.runs()).extracting(RunResult::checks).isEqualTo(one.runs().stream().map(RunResult::checks).toList());
        // not vacuous: the drawn faults reach the runs, which do not all come out alike
        assertThat(one.runs()).extracting(r -> r.checks().get(0).decidingFigure()).doesNotHaveDuplicates();
    }

    @Test
    void shouldRecordARunThatThrowsWithItsSeedAndStackTraceAndGoOn() throws Exception {
        Path file = CampaignFiles.campaign(dir, "throws.yaml", """
                runs: 4
                masterSeed: 3
                faultsPerRun: 1
                faults:
                  - {type: commandDrop, targets: [ridge-hydro-1], startS: 0, durationS: 10}
                """);
        CampaignSpec spec = CampaignReader.read(file, dir);
        // runs cut short to their scenario's seed: run 3 throws, the others pass without running the physics
        long seedOf3 = CampaignExpander.runSeed(spec.masterSeed(), 3);
        RunExecutor executor = (site, scenario) -> {
            if (Files.readString(scenario).contains("seed: " + seedOf3 + "\n")) {
                throw new IllegalStateException("deliberate failure of the run with seed " + seedOf3);
            }
            return List.of(new CheckOutcome("frequency-back", true, 40, "s", 130, "stand-in", false));
        };
        List<String> progress = new ArrayList<>();
        Path folder = Files.createDirectories(dir.resolve("campaign"));
        CampaignRunner.Result r = new CampaignRunner(spec, CampaignExpander.of(spec).expand(), executor, 2, new VirtualClock(WALL_MS),
                progress::add).run(folder, true);
        CampaignReport.write(r);

        assertThat(r.runs()).extracting(RunResult::status).containsExactly(RunResult.Status.PASS, RunResult.Status.PASS,
                RunResult.Status.ERROR, RunResult.Status.PASS);
        RunResult thrown = r.runs().get(2);
        assertThat(thrown.plan().seed()).isEqualTo(seedOf3);
        assertThat(thrown.error()).startsWith("java.lang.IllegalStateException: deliberate failure").contains("at org.loopstand.app.campaign");
        assertThat(progress).last().asString().contains("4/4 runs done, 0 failing, 1 error");
        String html = Files.readString(folder.resolve("report.html"));
        assertThat(html).contains("Runs that threw (1)", "Run 3, seed " + seedOf3, "deliberate failure of the run");
        assertThat(Files.readString(folder.resolve("campaign.json"))).contains("\"errors\" : 1", "IllegalStateException");
    }
}
