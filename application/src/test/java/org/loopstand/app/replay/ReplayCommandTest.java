package org.loopstand.app.replay;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.app.lockstep.LockstepRehearsal;
import org.loopstand.protocol.journal.JournalReader;
import picocli.CommandLine;

/**
 * {@code replay RUN} on a lockstep run folder made here ({@link LockstepRehearsal}, the process tests' short
 * unit-trip scenario, 120 s, with the built-in controller): every entry matches; a journal with one input value changed
 * diverges, and the first divergence names both values; a journal without inputs, of schema version 1, with
 * a cycle time that runs backwards, or no run folder at all is refused with the file and line.
 */
class ReplayCommandTest {
    static final Path CONFIG = Path.of("..", "config");
    static final Path SITE = CONFIG.resolve("sites/demo-site.yaml");

    @TempDir
    static Path shared;
    static Path run;

    @TempDir
    Path tmp;

    record Ran(int exitCode, String out, String err) {
    }

    @BeforeAll
    static void recordALockstepRun() throws Exception {
        run = Files.createDirectory(shared.resolve("unit-trip-lockstep"));
        new LockstepRehearsal(SITE, Path.of("src", "test", "resources", "rehearsal", "short-trip.yaml"), 7L).run(run);
    }

    static Ran replay(Path folder) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = new CommandLine(new ReplayCommand(new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8)))
                .execute(folder.toString(), "--site", SITE.toString());
        return new Ran(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    /** A copy of the run's controller journal with its lines as {@code edit} leaves them. */
    private Path copyWith(java.util.function.UnaryOperator<List<String>> edit) throws IOException {
        Path copy = Files.createDirectory(tmp.resolve("copy"));
        List<String> lines = new ArrayList<>(Files.readAllLines(run.resolve("controller.jsonl")));
        Files.write(copy.resolve("controller.jsonl"), edit.apply(lines));
        return copy;
    }

    @Test
    void shouldMatchEveryEntryOfALockstepRunAndCountItsDecisions() {
        long decided = JournalReader.readAll(run.resolve("controller.jsonl")).entries().stream()
                .filter(e -> e.kind().equals("decided")).count();
        long inputs = JournalReader.readAll(run.resolve("controller.jsonl")).entries().stream()
                .filter(e -> e.kind().equals("input")).count();

        Ran r = replay(run);

        assertThat(r.exitCode()).as(r.out() + r.err()).isZero();
        // the scenario's 120 s at the demo site's 4 s cycle: 30 cycles (and the one at the very start), all replayed
        assertThat(decided).isBetween(30L, 31L);
        assertThat(r.out()).startsWith("replay: " + decided + " decisions matched (")
                .contains(inputs + " inputs fed");
    }

    @Test
    void shouldGiveTheFirstDivergenceWithBothValuesWhenOneReceivedValueWasChanged() throws Exception {
        Pattern freq = Pattern.compile("\\\\\"frequencyHz\\\\\":([0-9.]+)");
        int[] tampered = {-1};
        Path copy = copyWith(lines -> {
            // the last meter reading before the 15th cycle: the one that cycle uses (a later one would replace it)
            int decided = 0;
            int cycle = 0;
            while (decided < 15) {
                if (lines.get(++cycle).contains("\"kind\":\"decided\"")) {
                    decided++;
                }
            }
            for (int i = cycle - 1; i > 0; i--) {
                String l = lines.get(i);
                if (l.contains("\"kind\":\"input\"") && l.contains("/meter/")) {
                    Matcher m = freq.matcher(l);
                    assertThat(m.find()).as(l).isTrue();
                    // a meter reading 0.4 Hz low: the area's ACE, hence the cycle's decision, moves with it
                    double changed = Double.parseDouble(m.group(1)) - 0.4;
                    lines.set(i, l.substring(0, m.start(1)) + changed + l.substring(m.end(1)));
                    tampered[0] = i + 1;
                    break;
                }
            }
            return lines;
        });

        Ran r = replay(copy);

        assertThat(r.exitCode()).as(r.out() + r.err()).isEqualTo(1);
        Matcher d = Pattern.compile("DIVERGED after (\\d+) matching decisions, at entry (\\d+) \\(line (\\d+), t=(\\d+), (\\w+)\\):"
                + " (\\S+): recorded (.+), replayed (.+)").matcher(r.out());
        assertThat(d.find()).as(r.out()).isTrue();
        // the replay took the changed reading as it took the others: the first entry that differs comes after it
        assertThat(Long.parseLong(d.group(3))).isGreaterThan(tampered[0]);
        assertThat(d.group(7)).isNotEqualTo(d.group(8));
        assertThat(d.group(7)).isNotEqualTo(Divergence.NONE);
        assertThat(d.group(8)).isNotEqualTo(Divergence.NONE);
    }

    @Test
    void shouldRefuseAJournalWithoutInputsNamingTheFile() throws Exception {
        Path copy = copyWith(lines -> lines.stream().filter(l -> !l.contains("\"kind\":\"input\"")).toList());

        Ran r = replay(copy);

        assertThat(r.exitCode()).isEqualTo(2);
        assertThat(r.err()).contains(copy.resolve("controller.jsonl").toString(), "no input entry");
    }

    @Test
    void shouldRefuseAJournalOfSchemaVersionOneNamingFileAndLine() throws Exception {
        Path copy = copyWith(lines -> {
            lines.set(0, lines.get(0).replace("\"schemaVersion\":2", "\"schemaVersion\":1"));
            return lines;
        });

        Ran r = replay(copy);

        assertThat(r.exitCode()).isEqualTo(2);
        assertThat(r.err()).contains(copy.resolve("controller.jsonl") + ":1: journal schemaVersion 1 holds no inputs");
    }

    @Test
    void shouldRefuseAJournalWhoseCycleTimeRunsBackwardsNamingTheLine() throws Exception {
        int[] line = {0};
        Path copy = copyWith(lines -> {
            int decided = 0;
            for (int i = 0; i < lines.size(); i++) {
                if (lines.get(i).contains("\"kind\":\"decided\"") && ++decided == 3) {
                    lines.set(i, lines.get(i).replaceFirst("\"pollNs\":\\d+", "\"pollNs\":1"));
                    line[0] = i + 1;
                    break;
                }
            }
            return lines;
        });

        Ran r = replay(copy);

        assertThat(r.exitCode()).isEqualTo(2);
        assertThat(r.err()).contains(copy.resolve("controller.jsonl") + ":" + line[0] + ": monotonic time set back");
    }

    @Test
    void shouldRefuseAFolderWithoutAControllerJournal() throws Exception {
        Path empty = Files.createDirectory(tmp.resolve("empty"));

        Ran r = replay(empty);

        assertThat(r.exitCode()).isEqualTo(2);
        assertThat(r.err()).contains(empty + ": not a run folder with a controller journal (no controller.jsonl)");
    }
}
