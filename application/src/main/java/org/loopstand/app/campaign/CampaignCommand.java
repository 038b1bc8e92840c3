package org.loopstand.app.campaign;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

import org.loopstand.app.rehearsal.Rehearsal;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code loopstand campaign FILE}: expands a campaign file into seeded runs, runs them in lockstep with
 * the built-in controller on a worker pool, shrinks the failing ones and writes the campaign folder
 * ({@code runs/<time>-campaign-<name>/}: report.html, campaign.json, runs.csv, scenarios/, shrunk/).
 */
@Command(name = "campaign", mixinStandardHelpOptions = true,
        description = {"Run a seeded fault campaign: the campaign file's runs, each the base scenario plus drawn faults and load"
                + " events, closed loop in lockstep with the built-in controller on a worker pool; failing runs are shrunk to the"
                + " smallest failing combination found. Report and summaries in runs/<timestamp>-campaign-<name>/ (docs/campaigns.md).",
                "Exit code: 0 when every run passed, 1 when a run failed or threw, 2 on bad options or a refused campaign file.",
                "CAUTION: the controller computes raise/lower commands; here they only reach the emulated plant in memory."})
public final class CampaignCommand implements Callable<Integer> {
    /** Failing runs and shrunk combinations printed on the terminal, at most (all are in the report). */
    static final int PRINTED = 10;

    @Parameters(paramLabel = "FILE", description = "campaign file (YAML), e.g. config/campaigns/demo-unit-trip.yaml")
    Path file;

    @Option(names = "--runs", paramLabel = "N", description = "run count replacing the file's")
    Integer runs;

    @Option(names = "--workers", paramLabel = "W", description = "worker threads (default: the machine's cores)",
            defaultValue = "0", showDefaultValue = picocli.CommandLine.Help.Visibility.NEVER)
    int workers;

    @Option(names = "--runs-dir", defaultValue = "runs", description = "where the campaign folder goes (default ${DEFAULT-VALUE})")
    Path runsDir;

    @Option(names = "--no-shrink", description = "report failing runs without shrinking them")
    boolean noShrink;

    private final PrintStream out;
    private final PrintStream err;
    private final Clock wall;
    private final RunExecutor executor;

    public CampaignCommand() {
        this(System.out, System.err, WallClock.INSTANCE, RunExecutor.LOCKSTEP);
    }

    /** @param wall names the campaign folder and times the progress; every run is on its own virtual clock */
    public CampaignCommand(PrintStream out, PrintStream err, Clock wall, RunExecutor executor) {
        this.out = out;
        this.err = err;
        this.wall = wall;
        this.executor = executor;
    }

    @Override
    public Integer call() throws Exception {
        if (!Files.isRegularFile(file)) {
            err.println("campaign: file " + file + " does not exist");
            return 2;
        }
        if (runs != null && (runs < 1 || runs > 1_000_000)) {
            err.println("campaign: --runs must lie in [1, 1000000], got " + runs);
            return 2;
        }
        int w = workers > 0 ? workers : Runtime.getRuntime().availableProcessors();
        CampaignSpec spec;
        List<RunPlan> plans;
        try {
            spec = CampaignReader.read(file, org.loopstand.protocol.config.InstallFolder.fromEnvironment().home());
            spec = runs == null ? spec : spec.withRuns(runs);
            plans = CampaignExpander.of(spec).expand();
        } catch (ConfigFileException e) {
            err.println("campaign: refused, no run started:");
            err.println(e.getMessage());
            return 2;
        } catch (IllegalArgumentException e) {
            err.println("campaign: refused, no run started: " + e.getMessage());
            return 2;
        }
        quietRuns();
        Path folder = Rehearsal.newRunFolder(runsDir, "campaign-" + spec.name(), wall);
        out.println("campaign: " + spec.name() + ": " + spec.runs() + " runs of " + spec.scenarioFile() + " on " + spec.siteFile()
                + ", master seed " + spec.masterSeed() + ", " + w + " worker" + (w == 1 ? "" : "s") + ", lockstep with the built-in controller");
        out.println("campaign: folder " + folder);
        CampaignRunner.Result result = new CampaignRunner(spec, plans, executor, w, wall, out::println).run(folder, !noShrink);
        CampaignReport.write(result);
        print(result);
        out.println("report: " + folder.resolve("report.html").toAbsolutePath());
        return result.count(RunResult.Status.PASS) == result.runs().size() ? 0 : 1;
    }

    /** Hundreds of runs: their plant and controller log lines (refusals, exclusions) would bury the progress; the report has the outcomes. */
    private static void quietRuns() {
        if (org.slf4j.LoggerFactory.getLogger("org.loopstand") instanceof ch.qos.logback.classic.Logger l) {
            l.setLevel(ch.qos.logback.classic.Level.ERROR);
        }
    }

    private void print(CampaignRunner.Result r) {
        new CampaignStats(r.runs()).checkRates().forEach(c -> out.println(String.format(java.util.Locale.ROOT,
                "check %-28s passed in %d of %d runs", c.check(), c.passed(), c.runs())));
        out.println("campaign: " + r.count(RunResult.Status.PASS) + " passed, " + r.count(RunResult.Status.FAIL) + " failed, "
                + r.count(RunResult.Status.ERROR) + " errors in " + r.runs().size() + " runs");
        r.runs().stream().filter(x -> x.status() != RunResult.Status.PASS).limit(PRINTED).forEach(x -> out.println(
                "  run " + x.plan().index() + " " + x.status() + (x.error() != null ? " (threw: " + x.error().lines().findFirst().orElse("")
                        + ")" : " " + x.failingChecks()) + ": " + CampaignReport.reproduce(r, x)));
        for (RunResult.Shrunk s : r.shrunk().subList(0, Math.min(PRINTED, r.shrunk().size()))) {
            out.println("smallest failing combination from run " + s.runIndex() + " (" + s.check() + " fails, " + s.runsTried()
                    + " shrink runs): " + (s.smallest().describe().isEmpty() ? CampaignHtml.NOTHING_DRAWN + " " + s.smallest().seed()
                    : String.join("; ", s.smallest().describe())));
            out.println("  reproduce: " + CampaignReport.reproduce(r, s));
        }
    }
}
