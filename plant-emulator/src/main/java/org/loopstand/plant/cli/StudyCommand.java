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
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.ProgressReporter;
import org.loopstand.plant.study.StudyResult;
import org.loopstand.plant.study.StudyRunner;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code loopstand study}: runs a scenario on the physics alone, as fast as possible, into a directory. */
@Command(name = "study", mixinStandardHelpOptions = true,
        description = "Run the grid physics with a virtual clock (no broker) and write trace.csv and summary.json.")
public final class StudyCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--site", description = "site file (YAML); default: the scenario's siteId found as rehearse finds it"
            + " (<siteId>.yaml beside the scenario, in a sites/ folder next to it, or in the shipped config/sites/)")
    private Path site;

    @Option(names = "--scenario",
            description = "scenario file (YAML); a rehearsal scenario too: its faults apply to the physics, its checks are decided, its rate is unused")
    private Path scenarioFile;

    @Parameters(arity = "0..1", paramLabel = "SCENARIO", description = "the scenario file, as --scenario")
    private Path scenarioArgument;

    @Option(names = "--out", description = "output directory (created if missing); default runs/<time>-<scenario>-study")
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
        if (scenarioFile == null) {
            scenarioFile = scenarioArgument;
        } else if (scenarioArgument != null && !scenarioArgument.equals(scenarioFile)) {
            System.err.println("study: two scenarios given (" + scenarioArgument + " and --scenario " + scenarioFile + "); give one");
            return 2;
        }
        if (scenarioFile == null) {
            System.err.println("study: give a scenario: loopstand study SCENARIO [--site FILE] [--out DIR]"
                    + " (add --with-controller for the closed loop with the built-in controller)");
            return 2;
        }
        try {
            if (site == null) {
                site = siteOf(scenarioFile);
            }
            if (out == null) {
                out = defaultOut(scenarioFile, WallClock.INSTANCE.epochMillis());
            }
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

    /** @return the site file a scenario names by its {@code siteId:} (old spelling {@code site:}), found as rehearse finds it */
    static Path siteOf(Path scenario) {
        String siteId = YamlNode.topLevelText(scenario, "siteId").or(() -> YamlNode.topLevelText(scenario, "site"))
                .orElseThrow(() -> new ConfigFileException(java.util.List.of(scenario + ":1:1: the scenario names no site"
                        + " (top-level siteId:); give --site FILE")));
        return org.loopstand.protocol.config.InstallFolder.fromEnvironment().siteFor(scenario, siteId);
    }

    /** @return {@code runs/<yyyyMMdd-HHmmss>-<scenario>-study} at {@code wallMs} (local time), as rehearse names its folders */
    static Path defaultOut(Path scenario, long wallMs) {
        String stamp = java.time.format.DateTimeFormatter.ofPattern("yyyyMMdd-HHmmss", java.util.Locale.ROOT)
                .format(java.time.Instant.ofEpochMilli(wallMs).atZone(java.time.ZoneId.systemDefault()));
        return Path.of("runs", stamp + "-" + scenario.getFileName().toString().replaceFirst("\\.ya?ml$", "") + "-study");
    }
}
