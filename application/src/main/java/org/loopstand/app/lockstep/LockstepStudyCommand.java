package org.loopstand.app.lockstep;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

import org.loopstand.app.rehearsal.Rehearsal;
import org.loopstand.app.rehearsal.VerdictLines;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.report.model.ReportModel;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code loopstand study SCENARIO --with-controller}: the scenario {@code rehearse} takes, run in lockstep
 * with the built-in controller on an in-memory bus ({@link LockstepRehearsal}); run folder, checks,
 * verdict and report as a rehearsal gives them. The physics-only {@code study} stays the plant's command;
 * the launcher routes {@code study} here when {@code --with-controller} is given.
 */
@Command(name = "study", mixinStandardHelpOptions = true,
        description = {"With --with-controller: run a rehearsal scenario closed loop in lockstep (plant, built-in controller"
                + " and an in-memory bus on one virtual clock, as fast as the machine goes), with journals, checks, verdict"
                + " and report in runs/<timestamp>-<scenario>-lockstep/. Without it, `./loopstand study` runs the physics alone.",
                "Exit code: 0 when the verdict is PASS (or the scenario decided no check), 1 on a FAIL or CUT SHORT verdict"
                        + " or when the report could not be made, 2 on bad options or a refused file.",
                "CAUTION: the controller computes raise/lower commands; here they only reach the emulated plant in memory."})
public final class LockstepStudyCommand implements Callable<Integer> {
    static final String DEFAULT_SCENARIO = "config/scenarios/rehearse-unit-trip.yaml";

    @Parameters(arity = "0..1", paramLabel = "SCENARIO", description = "scenario file, as for rehearse (default " + DEFAULT_SCENARIO + ")")
    Path scenario;

    @Option(names = "--with-controller", required = true, description = "run the built-in controller in the loop (required here)")
    boolean withController;

    @Option(names = "--site", description = "site file (default: config/sites/<the scenario's site>.yaml)")
    Path site;

    @Option(names = "--seed", paramLabel = "N", description = "random seed replacing the scenario's (load noise, fault draws)")
    Long seed;

    @Option(names = "--runs-dir", defaultValue = "runs", description = "where run folders go (default ${DEFAULT-VALUE})")
    Path runsDir;

    private final PrintStream out;
    private final PrintStream err;
    private final Clock wall;

    public LockstepStudyCommand() {
        this(System.out, System.err, WallClock.INSTANCE);
    }

    /** @param wall names the run folder only; the run itself is on the study's virtual clock */
    public LockstepStudyCommand(PrintStream out, PrintStream err, Clock wall) {
        this.out = out;
        this.err = err;
        this.wall = wall;
    }

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.config.InstallFolder install = org.loopstand.protocol.config.InstallFolder.fromEnvironment();
        Path scenarioFile = scenario != null ? scenario : install.shipped(DEFAULT_SCENARIO);
        if (!Files.isRegularFile(scenarioFile)) {
            err.println("study: scenario file " + scenarioFile + " does not exist");
            return 2;
        }
        org.loopstand.protocol.config.OldKeys.SCENARIO.warn(scenarioFile, err::println);
        Path siteFile = site;
        if (siteFile == null) {
            String id = Rehearsal.scenarioSiteId(scenarioFile);
            if (id == null) {
                err.println("study: scenario " + scenarioFile + " names no site (top-level 'siteId:'); give --site FILE");
                return 2;
            }
            try {
                siteFile = install.siteFor(scenarioFile, id);
            } catch (IllegalArgumentException e) {
                err.println("study: " + e.getMessage());
                return 2;
            }
        }
        String name = scenarioFile.getFileName().toString().replaceFirst("\\.ya?ml$", "") + "-lockstep";
        Path run = Rehearsal.newRunFolder(runsDir, name, wall);
        out.println("study: " + scenarioFile + " on " + siteFile + " with the built-in controller, lockstep on a virtual clock"
                + (seed == null ? "" : ", random seed " + seed));
        out.println("study: run folder " + run);
        LockstepRehearsal.Outcome o;
        try {
            o = new LockstepRehearsal(siteFile, scenarioFile, seed).warningsTo(err::println).run(run);
        } catch (ConfigFileException e) {
            err.println("study: refused:");
            err.println(e.getMessage());
            return refusedBeforeRunning(run);
        } catch (IllegalArgumentException e) {
            err.println("study: refused: " + e.getMessage());
            return refusedBeforeRunning(run);
        }
        for (CheckOutcome c : o.checks()) {
            out.println("check " + c);
        }
        ReportModel model = o.report();
        VerdictLines.of(model).forEach(out::println);
        out.println("report: " + run.resolve("report.html").toAbsolutePath());
        return model.verdict() == ReportModel.Verdict.FAIL || model.verdict() == ReportModel.Verdict.CUT_SHORT ? 1 : 0;
    }

    /** Refused before anything ran: the run folder holds nothing, so it does not stay behind. @return exit code 2 */
    private int refusedBeforeRunning(Path run) {
        try (var entries = java.nio.file.Files.list(run)) {
            if (entries.findAny().isEmpty()) {
                java.nio.file.Files.delete(run);
                err.println("study: nothing ran; run folder " + run + " removed");
            }
        } catch (java.io.IOException e) {
            err.println("study: run folder " + run + " left as it is: " + e.getMessage());
        }
        return 2;
    }
}
