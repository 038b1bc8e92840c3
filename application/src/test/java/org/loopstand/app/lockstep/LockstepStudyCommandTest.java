package org.loopstand.app.lockstep;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.time.VirtualClock;
import picocli.CommandLine;

/**
 * {@code study SCENARIO --with-controller} on a shipped scenario: the run folder a real-time rehearsal
 * writes, the checks and verdict on the terminal, an exit code that follows the verdict, and journals that
 * are the same byte for byte for the same scenario and random seed.
 */
class LockstepStudyCommandTest {
    static final Path CONFIG = Path.of("..", "config");
    static final Path UNIT_TRIP = CONFIG.resolve("scenarios/rehearse-unit-trip.yaml");
    /** 300 s with a load step and faults that draw at random (noise, loss, jitter, lost commands). */
    static final Path RANDOM_FAULTS = Path.of("src", "test", "resources", "lockstep", "random-faults.yaml");
    /** Names the run folders only (2026-03-01T10:00:00Z); the runs are on the study's virtual clock. */
    static final long WALL_MS = 1_772_359_200_000L;

    @TempDir
    Path runs;

    record Ran(int exitCode, String out, Path folder) {
    }

    private Ran study(String... extra) throws Exception {
        return study(UNIT_TRIP, extra);
    }

    private Ran study(Path scenario, String... extra) throws Exception {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream ps = new PrintStream(buf, true, StandardCharsets.UTF_8);
        List<String> args = new java.util.ArrayList<>(List.of(scenario.toString(), "--with-controller",
                "--site", CONFIG.resolve("sites/demo-site.yaml").toString(), "--runs-dir", runs.toString()));
        args.addAll(List.of(extra));
        int code = new CommandLine(new LockstepStudyCommand(ps, ps, new VirtualClock(WALL_MS))).execute(args.toArray(String[]::new));
        String out = buf.toString(StandardCharsets.UTF_8);
        String folderLine = out.lines().filter(l -> l.startsWith("study: run folder ")).findFirst().orElseThrow(() -> new AssertionError(out));
        return new Ran(code, out, Path.of(folderLine.substring("study: run folder ".length())));
    }

    @Test
    void shouldWriteTheRehearsalsRunFolderAndPrintTheChecksAndAPassingVerdict() throws Exception {
        Ran r = study();

        assertThat(r.out()).contains("check PASS frequency-back", "check PASS tie-back", "check PASS ace-recovered",
                "verdict: PASS (3 of 3 checks passed)");
        assertThat(r.exitCode()).as(r.out()).isZero();
        try (Stream<Path> files = Files.list(r.folder())) {
            assertThat(files.map(p -> p.getFileName().toString()))
                    .contains("plant.jsonl", "plant.hlog", "controller.jsonl", "controller.hlog", "report.html");
        }
        JournalReader.Contents plant = JournalReader.readAll(r.folder().resolve("plant.jsonl"));
        JournalReader.Contents controller = JournalReader.readAll(r.folder().resolve("controller.jsonl"));
        // the plant journal holds what the report reads: the decided checks, the controller's statuses as received,
        // command fates; the controller's its decisions; both closed with an end entry at the 1200 s scenario end
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("check")).hasSize(3);
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("controllerStatus")).hasSizeGreaterThan(200);
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("command")).hasSizeGreaterThan(10);
        assertThat(controller.entries()).filteredOn(e -> e.kind().equals("decided")).hasSizeGreaterThan(200);
        String report = Files.readString(r.folder().resolve("report.html"));
        assertThat(report).contains("frequency-back", "tie-back", "ace-recovered", "lockstep");
    }

    /** The same command in a JVM of its own (the JDK's Map.of / Set.of order changes from one JVM to the next). */
    private Path studyInOwnJvm(String seed) throws Exception {
        Path log = runs.resolve("child-" + seed + ".log");
        Process p = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-cp",
                System.getProperty("java.class.path"), org.loopstand.app.cli.AppCli.class.getName(), "study",
                RANDOM_FAULTS.toString(), "--with-controller", "--site", CONFIG.resolve("sites/demo-site.yaml").toString(),
                "--runs-dir", runs.resolve("child").toString(), "--seed", seed)
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        assertThat(p.waitFor(120, java.util.concurrent.TimeUnit.SECONDS)).as("child study finished").isTrue();
        String out = Files.readString(log);
        assertThat(p.exitValue()).as(out).isZero();
        String folderLine = out.lines().filter(l -> l.startsWith("study: run folder ")).findFirst().orElseThrow(() -> new AssertionError(out));
        return Path.of(folderLine.substring("study: run folder ".length()));
    }

    @Test
    void shouldGiveByteIdenticalJournalsForTheSameScenarioAndRandomSeedAndOthersForAnotherSeed() throws Exception {
        Ran first = study(RANDOM_FAULTS, "--seed", "7");
        Ran second = study(RANDOM_FAULTS, "--seed", "7");
        Path inOwnJvm = studyInOwnJvm("7");
        Ran other = study(RANDOM_FAULTS, "--seed", "8");
        // the faults drew: scans lost at random, commands lost at random, so the comparison covers the fault draws too
        JournalReader.Contents plant = JournalReader.readAll(first.folder().resolve("plant.jsonl"));
        assertThat(plant.entries()).anyMatch(e -> e.kind().equals("published") && "dropped".equals(e.text("fate")));
        assertThat(plant.entries()).anyMatch(e -> e.kind().equals(org.loopstand.plant.fault.FaultJournal.KIND_COMMAND_FAULT)
                && "dropped".equals(e.text("fate")));

        assertThat(second.folder()).isNotEqualTo(first.folder());
        // no field is left out of the comparison: every journal time is scenario time on the virtual clock and
        // flushes follow that clock; only the run folder's name (and the report naming it) carries wall time
        for (String file : List.of("plant.jsonl", "controller.jsonl", "plant.hlog", "controller.hlog")) {
            byte[] expected = Files.readAllBytes(first.folder().resolve(file));
            assertThat(Files.readAllBytes(second.folder().resolve(file))).as(file).isEqualTo(expected);
            assertThat(Files.readAllBytes(inOwnJvm.resolve(file))).as(file + " from another JVM").isEqualTo(expected);
        }
        // not vacuous: the random seed reaches the load noise and the fault draws, so another seed gives another journal
        assertThat(Files.readAllBytes(other.folder().resolve("plant.jsonl")))
                .isNotEqualTo(Files.readAllBytes(first.folder().resolve("plant.jsonl")));
    }

    @Test
    void shouldRefuseABadScenarioAtItsLineAndLeaveNoEmptyRunFolder() throws Exception {
        Path bad = java.nio.file.Files.writeString(runs.resolve("bad.yaml"), """
                siteId: demo-site
                durationS: 300
                checks:
                  - {name: freq-back, type: frequencyRestored, area: north-basin, afterS: 30, withinS: 900}
                """);
        Ran ran = study(bad);

        assertThat(ran.exitCode()).isEqualTo(2);
        assertThat(ran.out()).contains("bad.yaml:4:5: check freq-back: its window ends at 930.0 s");
        assertThat(ran.folder()).doesNotExist();
        assertThat(ran.out()).contains("nothing ran; run folder " + ran.folder() + " removed");
    }
}
