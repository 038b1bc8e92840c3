package org.loopstand.app.replay;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import picocli.CommandLine;

/**
 * {@code replay RUN} on the controller journal of a real-time rehearsal recorded once and kept as a test
 * resource: plant and built-in controller as processes of their own over the embedded MQTT broker, the
 * controller following the plant's clock ({@code --clock bus}), {@code scenario.yaml} at rate 10 on a
 * loaded machine (the plant held and slowed its clock). {@code site.yaml} is the demo site as it was then,
 * so that later tuning of the shipped site does not change what this journal must replay to.
 */
class RecordedRehearsalReplayTest {
    static final Path RECORDED = Path.of("src", "test", "resources", "replay", "realtime-short-freeze");

    @TempDir
    Path tmp;

    private String replay(Path run) {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream ps = new PrintStream(buf, true, StandardCharsets.UTF_8);
        int code = new CommandLine(new ReplayCommand(ps, ps)).execute(run.toString(), "--site",
                RECORDED.resolve("site.yaml").toString());
        return code + " " + buf.toString(StandardCharsets.UTF_8);
    }

    @Test
    void shouldReproduceEveryDecisionOfTheRealTimeRehearsal() {
        List<JournalEntry> entries = JournalReader.readAll(RECORDED.resolve("controller.jsonl")).entries();
        // a real-time run: cycles started late by wall-clock amounts, not on the schedule as in lockstep,
        // and the frozen meter suspended both areas (events the replay must give again)
        assertThat(entries).filteredOn(e -> e.kind().equals("decided")).anyMatch(e -> e.get("jitterUs").asLong() > 0);
        assertThat(entries).filteredOn(e -> "areaSuspended".equals(e.text("event"))).hasSize(2);

        assertThat(replay(RECORDED)).startsWith("0 replay: 26 decisions matched (580 journal entries, 470 inputs fed)");
    }

    @Test
    void shouldDivergeAtTheFirstCycleThatUsedAChangedMeterReadingAndShowBothValues() throws Exception {
        Path copy = Files.createDirectory(tmp.resolve("run"));
        List<String> lines = new java.util.ArrayList<>(Files.readAllLines(RECORDED.resolve("controller.jsonl")));
        // the last north-basin meter reading before the 5th cycle (the one it used) reads 50 mHz lower
        int cycle = 0;
        for (int decided = 0; decided < 5; ) {
            if (lines.get(++cycle).contains("\"kind\":\"decided\"")) {
                decided++;
            }
        }
        int meter = cycle;
        while (!(lines.get(meter).contains("\"kind\":\"input\"") && lines.get(meter).contains("north-basin/meter/"))) {
            meter--;
        }
        Matcher f = Pattern.compile("\\\\\"frequencyHz\\\\\":([0-9.]+)").matcher(lines.get(meter));
        assertThat(f.find()).as(lines.get(meter)).isTrue();
        double recordedHz = Double.parseDouble(f.group(1));
        lines.set(meter, lines.get(meter).substring(0, f.start(1)) + (recordedHz - 0.05) + lines.get(meter).substring(f.end(1)));
        Files.write(copy.resolve("controller.jsonl"), lines);

        String out = replay(copy);

        Matcher d = Pattern.compile("^1 replay: DIVERGED after 4 matching decisions, at entry (\\d+) \\(line (\\d+), t=(\\d+),"
                + " decided\\): areas\\[0]\\.aceMw: recorded (\\S+), replayed (\\S+)").matcher(out);
        assertThat(d.find()).as(out).isTrue();
        // the first entry that differs is the 5th cycle's decision, on north-basin's ACE (nothing before it moved)
        assertThat(Integer.parseInt(d.group(2))).as(out).isEqualTo(cycle + 1);
        // ACE = ΔP_tie + K·Δf (the site's european convention, K = kMwPerHz 954 for north-basin): 50 mHz less
        // frequency is 47.7 MW less ACE, the tie flow being the same reading's
        assertThat(Double.parseDouble(d.group(5)) - Double.parseDouble(d.group(4))).isCloseTo(-954 * 0.05,
                org.assertj.core.data.Offset.offset(1e-6));
        assertThat(out).doesNotContain(Divergence.NONE);
    }
}
