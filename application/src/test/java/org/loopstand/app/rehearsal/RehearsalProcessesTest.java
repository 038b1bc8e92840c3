package org.loopstand.app.rehearsal;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.regex.Pattern;

import org.awaitility.Awaitility;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.time.WallClock;

/**
 * The real rehearsal with the plant and the controller as child JVMs (this module's test class path
 * holds both), on a 120 s scenario at rate 20 and a free loopback port for the embedded broker.
 */
class RehearsalProcessesTest {
    static final Path SCENARIO = Path.of("src", "test", "resources", "rehearsal", "short-trip.yaml");
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final Pattern EXTERNAL = Pattern.compile("(?i)(src|href)\\s*=\\s*[\"']?\\s*(https?:|//)|url\\(\\s*[\"']?\\s*(https?:|//)|@import");

    @TempDir
    Path runs;

    final ByteArrayOutputStream output = new ByteArrayOutputStream();

    Rehearsal rehearsal(int port) {
        return rehearsal(port, 20);
    }

    Rehearsal rehearsal(int port, double rate) {
        String cp = System.getProperty("java.class.path");
        RehearsalSettings s = new RehearsalSettings(SCENARIO, SITE, null, rate, runs,
                Path.of(System.getProperty("java.home"), "bin", "java").toString(), cp, cp, port, 60_000, List.of(), Path.of(".."));
        return new Rehearsal(s, WallClock.INSTANCE, new PrintStream(output, true, StandardCharsets.UTF_8), false);
    }

    static int freePort() throws Exception {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            return s.getLocalPort();
        }
    }

    String out() {
        return output.toString(StandardCharsets.UTF_8);
    }

    @Test
    void shouldRunBothProcessesToTheEndAndWriteBothJournalsAndAnOfflineReport() throws Exception {
        Rehearsal.Outcome o = rehearsal(freePort()).run();
        // the run completed; its exit code follows the verdict (this short scenario's 80 s recovery limit is
        // tighter than the built-in controller's ramp-limited recovery, so the verdict itself is not asserted)
        assertThat(o.message()).as(out()).isNull();
        assertThat(o.exitCode()).isEqualTo(out().contains("verdict: PASS") ? 0 : 1);
        assertThat(out()).containsPattern("verdict: (PASS|FAIL) \\(");
        JournalReader.Contents plant = JournalReader.readAll(o.runFolder().resolve("plant.jsonl"));
        JournalReader.Contents controller = JournalReader.readAll(o.runFolder().resolve("controller.jsonl"));
        assertThat(plant.summary().endReason()).contains(EndReason.COMPLETED);
        assertThat(controller.summary().cutShort()).isFalse();
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("truth")).hasSizeGreaterThanOrEqualTo(119);
        assertThat(controller.entries()).anyMatch(e -> e.kind().equals("decided"));
        assertThat(plant.entries()).anyMatch(e -> e.kind().equals("command") && "accepted".equals(e.text("outcome")));
        assertThat(o.report()).exists();
        String html = Files.readString(o.report());
        assertThat(EXTERNAL.matcher(html).find()).isFalse();
        assertThat(html).contains("id=\"verdict\"").doesNotContain("CUT SHORT</div>");
        // the scenario's own check, decided by the plant at the end and shown in the pass/fail table
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("check")).singleElement()
                .satisfies(c -> assertThat(c.text("name")).isEqualTo("ace-recovered"));
        assertThat(html).contains("ace-recovered").contains("Area south-ridge: after unitTrip at 30 s");
        assertThat(out()).contains("report: " + o.report().toAbsolutePath());
        assertThat(o.runFolder().resolve("plant.log")).exists();
        assertThat(o.runFolder().resolve("controller.log")).exists();
        // exact replay of the real-time run: the controller journal's inputs, at their arrival times, into a
        // fresh controller on a virtual clock give every decision again, entry for entry
        long decided = controller.entries().stream().filter(e -> e.kind().equals("decided")).count();
        assertThat(replay(o.runFolder())).startsWith("0 replay: " + decided + " decisions matched (");
    }

    /** @return the exit code and what {@code replay RUN} printed */
    static String replay(Path run) {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream ps = new PrintStream(buf, true, StandardCharsets.UTF_8);
        int code = new picocli.CommandLine(new org.loopstand.app.replay.ReplayCommand(ps, ps))
                .execute(run.toString(), "--site", SITE.toString());
        return code + " " + buf.toString(StandardCharsets.UTF_8);
    }

    @Test
    void shouldSayClearlyThatTheControllerDiedAndMarkTheReportCutShort() throws Exception {
        Rehearsal r = rehearsal(freePort(), 5); // 24 s of wall time: room to kill mid-run
        CompletableFuture<Rehearsal.Outcome> run = CompletableFuture.supplyAsync(r::run);
        Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> r.pidOf("controller").isPresent()
                && controllerDecisions() >= 3);
        // SIGKILL the controller: the shell the rig started it through and every process under it
        ProcessHandle shell = ProcessHandle.of(r.pidOf("controller").getAsLong()).orElseThrow();
        shell.descendants().forEach(ProcessHandle::destroyForcibly);
        shell.destroyForcibly();
        Rehearsal.Outcome o = run.get();
        assertThat(o.exitCode()).isEqualTo(1);
        assertThat(o.message()).contains("the controller process died").contains("exit code 137");
        JournalReader.Contents controller = JournalReader.readAll(o.runFolder().resolve("controller.jsonl"));
        assertThat(controller.summary().cutShort()).isTrue();
        assertThat(controller.entries()).anyMatch(e -> e.kind().equals("decided"));
        // a journal cut short replays too, up to its last complete line
        long decided = controller.entries().stream().filter(e -> e.kind().equals("decided")).count();
        assertThat(replay(o.runFolder())).startsWith("0 replay: " + decided + " decisions matched (");
        // the plant was stopped by the rehearsal (SIGTERM): its journal is complete
        assertThat(JournalReader.readAll(o.runFolder().resolve("plant.jsonl")).summary().cutShort()).isFalse();
        String html = Files.readString(o.report());
        assertThat(html).contains("CUT SHORT").contains("The controller process died");
    }

    @Test
    void shouldSayClearlyThatThePlantDiedAndKeepItsJournalUpToTheLastCompleteLine() throws Exception {
        Rehearsal r = rehearsal(freePort(), 5); // 24 s of wall time: room to kill mid-run
        CompletableFuture<Rehearsal.Outcome> run = CompletableFuture.supplyAsync(r::run);
        Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> r.pidOf("plant").isPresent()
                && controllerDecisions() >= 3 && entriesSoFar("plant.jsonl", "truth") >= 10);
        // SIGKILL: no shutdown hook, no end entry, the embedded broker goes with it
        ProcessHandle.of(r.pidOf("plant").getAsLong()).orElseThrow().destroyForcibly();
        Rehearsal.Outcome o = run.get();
        assertThat(o.exitCode()).as(out()).isEqualTo(1);
        assertThat(o.message()).contains("the plant process died").contains("exit code 137");

        Path plantFile = o.runFolder().resolve("plant.jsonl");
        JournalReader.Contents plant = JournalReader.readAll(plantFile);
        assertThat(plant.summary().cutShort()).isTrue();
        assertThat(plant.summary().damagedLines()).isEmpty();
        assertThat(plant.entries()).filteredOn(e -> e.kind().equals("truth")).hasSizeGreaterThanOrEqualTo(10);
        // every complete line is read: the header plus one entry per newline; a torn last line starts
        // right after the last newline and is ignored
        byte[] bytes = Files.readAllBytes(plantFile);
        long newlines = 0;
        int lastNewline = -1;
        for (int i = 0; i < bytes.length; i++) {
            if (bytes[i] == '\n') {
                newlines++;
                lastNewline = i;
            }
        }
        assertThat(plant.summary().entriesAccepted()).isEqualTo(newlines - 1);
        boolean torn = lastNewline != bytes.length - 1;
        assertThat(plant.summary().tornTail()).isEqualTo(torn);
        if (torn) {
            assertThat(plant.summary().tornTailOffsetBytes()).isEqualTo(lastNewline + 1);
        }
        // the controller was stopped by the rehearsal (SIGTERM): its journal is complete
        assertThat(JournalReader.readAll(o.runFolder().resolve("controller.jsonl")).summary().cutShort()).isFalse();
        String html = Files.readString(o.report());
        assertThat(html).contains("CUT SHORT").contains("The plant process died");
    }

    @Test
    void shouldRefuseToStartWhenTheBrokerPortIsTaken() throws Exception {
        try (ServerSocket taken = new ServerSocket()) {
            taken.bind(new InetSocketAddress(InetAddress.getByName("127.0.0.1"), 0));
            Rehearsal.Outcome o = rehearsal(taken.getLocalPort()).run();
            assertThat(o.exitCode()).isEqualTo(2);
            assertThat(o.message()).contains("port " + taken.getLocalPort()).contains("is taken").contains("--broker URL");
            assertThat(o.report()).isNull();
        }
    }

    private long controllerDecisions() throws Exception {
        return entriesSoFar("controller.jsonl", "decided");
    }

    /** @return entries of one kind in a journal of the (only) run folder so far, 0 before it exists */
    private long entriesSoFar(String journal, String kind) throws Exception {
        try (var dirs = Files.list(runs)) {
            Path run = dirs.findFirst().orElse(null);
            if (run == null || !Files.exists(run.resolve(journal))) {
                return 0;
            }
            return JournalReader.readAll(run.resolve(journal)).entries().stream()
                    .filter(e -> e.kind().equals(kind)).count();
        }
    }
}
