package org.loopstand.plant.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.ProgressReporter;
import org.loopstand.plant.study.StudyResult;
import org.loopstand.plant.study.StudyRunner;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code loopstand study}: runs a scenario on the physics alone, as fast as possible, into a directory. */
@Command(name = "study", mixinStandardHelpOptions = true,
        description = "Run the grid physics with a virtual clock (no broker) and write trace.csv and summary.json.")
public final class StudyCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--site", required = true, description = "site file (YAML)")
    private Path site;

    @Option(names = "--scenario", required = true,
            description = "scenario file (YAML); a rehearsal scenario too: its faults apply to the physics, its checks are decided, its rate is unused")
    private Path scenarioFile;

    @Option(names = "--out", required = true, description = "output directory (created if missing)")
    private Path out;

    @Option(names = {"--duration-s", "--duration"}, description = "simulated seconds; overrides the scenario's durationS")
    private Double durationS;

    @Option(names = "--seed", description = "noise seed; overrides the scenario's seed")
    private Long seed;

    @Option(names = {"--trace-interval-s", "--trace-interval"}, description = "seconds between trace rows; overrides traceIntervalS")
    private Double traceIntervalS;

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.cli.OldSpellings.of("--duration", "--duration-s", "--trace-interval", "--trace-interval-s")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        try {
            Grid grid = SiteLoader.loadForRun(site, System.err::println);
            // one scenario format for every run: a rehearsal scenario's rate is unused here, its checks decided on the physics
            org.loopstand.protocol.config.OldKeys.SCENARIO.warn(scenarioFile, System.err::println);
            RunScenario rehearsal = RunScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid);
            RunScenarioLoader.startWarnings(scenarioFile, rehearsal, grid).forEach(System.err::println);
            Scenario scenario = rehearsal.scenario();
            if (durationS != null) {
                if (!(durationS > 0)) {
                    System.err.println("--duration-s must be greater than 0 s, got " + durationS);
                    return 2;
                }
                scenario = scenario.withDurationS(durationS);
            }
            if (seed != null) {
                scenario = scenario.withSeed(seed);
            }
            if (traceIntervalS != null) {
                scenario = scenario.withTraceIntervalS(traceIntervalS);
            }
            ProgressReporter progress = System.console() != null ? ProgressReporter.terminal(System.err) : ProgressReporter.NONE;
            StudyRunner runner = new StudyRunner(grid, new RunScenario(scenario, rehearsal.rateX(), rehearsal.faults(),
                    rehearsal.checks()), WallClock.INSTANCE, progress);
            StudyResult r = runner.run(out);
            System.out.printf(java.util.Locale.ROOT, "wrote %s and %s (%.0f s simulated)%n",
                    out.resolve("trace.csv"), out.resolve("summary.json"), r.simulatedSeconds());
            System.out.println((r.settled() ? "settled: " : "NOT settled (end values are a snapshot): ") + r.settledCriterion());
            for (CheckOutcome o : runner.checkOutcomes()) {
                System.out.println("check (physics only, no secondary control) " + o);
            }
            return 0;
        } catch (ConfigFileException e) {
            System.err.println("study: refused:");
            System.err.println(e.getMessage());
            return 2;
        } catch (IllegalArgumentException e) {
            System.err.println("study: refused: " + e.getMessage());
            return 2;
        }
    }
}
