package org.loopstand.app.replay;

import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code loopstand replay RUN}: feeds the inputs a run folder's controller journal holds, at their recorded
 * times, to a fresh built-in controller on a virtual clock and checks that its decisions match the journal
 * entry for entry ({@link JournalReplay}). Exit 0 when they all match, 1 at the first divergence (both
 * sides' values printed), 2 on bad input (no run folder, a journal of another schema version, one that
 * lacks the inputs, a site file that does not fit).
 */
@Command(name = "replay", mixinStandardHelpOptions = true,
        description = {"Replay a run folder's controller journal: the inputs the controller received, at their recorded"
                + " arrival times, into a fresh built-in controller on a virtual clock, stepping its duty cycle as the journal"
                + " says it ran; its decisions must match the journal entry for entry.",
                "Exit code: 0 when every entry matched, 1 at the first divergence (entry, time, field, recorded and replayed"
                        + " values), 2 on bad input (no run folder, another journal schema version, a journal without inputs,"
                        + " a site file that does not fit).",
                "CAUTION: the replayed controller computes raise/lower commands; they go nowhere."})
public final class ReplayCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "RUN", description = "run folder holding controller.jsonl (journal schema 2 or later)")
    Path run;

    @Option(names = "--site", description = "site file with the controller's settings (default: config/sites/<the journal's site>.yaml)")
    Path site;

    private final PrintStream out;
    private final PrintStream err;

    public ReplayCommand() {
        this(System.out, System.err);
    }

    public ReplayCommand(PrintStream out, PrintStream err) {
        this.out = out;
        this.err = err;
    }

    @Override
    public Integer call() throws IOException {
        RecordedJournal recorded;
        ControllerSiteConfig config;
        try {
            recorded = RecordedJournal.read(run);
            Path siteFile = site != null ? site : org.loopstand.protocol.config.InstallFolder.fromEnvironment()
                    .shipped("config/sites/" + recorded.siteId() + ".yaml");
            if (!Files.isRegularFile(siteFile)) {
                throw new ReplayRefused("site file " + siteFile + " does not exist (the journal's site is '"
                        + recorded.siteId() + "'); give --site FILE");
            }
            config = readSite(siteFile);
        } catch (ReplayRefused e) {
            err.println("replay: refused: " + e.getMessage());
            return 2;
        }
        Path work = Files.createTempDirectory("loopstand-replay");
        try {
            JournalReplay.Result r = new JournalReplay(recorded, config).run(work);
            if (r.divergence() == null) {
                out.println("replay: " + r.decisionsMatched() + " decisions matched (" + r.entriesCompared()
                        + " journal entries, " + r.inputsFed() + " inputs fed) in " + recorded.file());
                return 0;
            }
            out.println("replay: DIVERGED after " + r.decisionsMatched() + " matching decisions, at "
                    + r.divergence().describe());
            return 1;
        } catch (ReplayRefused e) {
            err.println("replay: refused: " + e.getMessage());
            return 2;
        } finally {
            deleteTree(work);
        }
    }

    private static ControllerSiteConfig readSite(Path siteFile) throws ReplayRefused {
        try {
            return ControllerSiteReader.read(siteFile);
        } catch (RuntimeException e) {
            throw new ReplayRefused(e.getMessage());
        }
    }

    private static void deleteTree(Path dir) {
        try (Stream<Path> s = Files.walk(dir)) {
            s.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
