package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.topic.TopicTree;
import com.fasterxml.jackson.databind.JsonNode;
import java.util.ArrayList;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * The controller's journal read back: every command sent is a {@code sent} entry (the command's kind
 * goes in {@code commandKind}, never in the reserved {@code kind} field, which once made the writer
 * throw on the first command), every accepted ack a {@code received} entry, every cycle a
 * {@code decided} entry, and the file ends cleanly.
 */
class ControllerJournalTest {
    /** The two-area study loop with the controller journaling into {@code file}. */
    private static StudyLoop journaledLoop(Path file) {
        return new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(),
                JournalWriter.create(file, "controller", StudyLoop.START_MS, new org.loopstand.protocol.time.VirtualClock(0)));
    }

    @Test
    void shouldJournalEveryCommandSentAndReadItBack(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = journaledLoop(file);
        loop.runTo(40);
        loop.sim.stepLoadMw("area1", 100);
        loop.runTo(121); // the last cycle at 120 s; its acks come back within the next slices
        loop.agent.onClose();

        JournalReader.Contents j = JournalReader.readAll(file);
        assertThat(j.summary().damagedLines()).isEmpty();
        assertThat(j.summary().endReason()).contains(EndReason.STOPPED);
        List<JournalEntry> sent = j.entries().stream().filter(e -> e.kind().equals(JournalFormat.KIND_SENT)).toList();
        List<UnitCommand> commands = loop.commands();
        assertThat(commands).isNotEmpty();
        assertThat(sent).hasSameSizeAs(commands);
        for (int i = 0; i < sent.size(); i++) {
            JournalEntry e = sent.get(i);
            UnitCommand c = commands.get(i);
            assertThat(e.text("kind")).isEqualTo("sent");
            assertThat(e.text("commandKind")).isEqualTo("pulse");
            assertThat(e.text("unit")).isEqualTo(c.unit());
            assertThat((long) e.number("seq").orElseThrow()).isEqualTo(c.seq());
            assertThat(e.text("direction")).isEqualTo(c.direction().name().toLowerCase(java.util.Locale.ROOT));
            assertThat((long) e.number("durationMs").orElseThrow()).isEqualTo(c.durationMs());
            assertThat((long) e.number("validUntil").orElseThrow()).isEqualTo(c.validUntil());
            assertThat(e.tMs()).isEqualTo(c.issuedAt());
        }
        long received = j.entries().stream().filter(e -> e.kind().equals(JournalFormat.KIND_RECEIVED)).count();
        assertThat(received).isEqualTo(loop.accepted().size()).isEqualTo(commands.size());
        long decided = j.entries().stream().filter(e -> e.kind().equals(JournalFormat.KIND_DECIDED)).count();
        assertThat(decided).isEqualTo(loop.agent.cyclesRun()).isGreaterThanOrEqualTo(29);
    }

    /**
     * Area 1's frequency sticks at 59.98 Hz from 60 s to 120 s: one {@code areaSuspended} event for area 1
     * naming the reason with the stuck reading, its age and the identical readings in a row, one
     * {@code areaResumed} after, and area 1 listed in the decided entries in between.
     */
    @Test
    void shouldJournalTheSuspensionOfOneAreaWithItsFiguresAndItsResumption(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = journaledLoop(file);
        loop.runTo(60);
        loop.tap.stuckFrequencyHzByArea.put("area1", 59.98);
        loop.runTo(120);
        loop.tap.stuckFrequencyHzByArea.clear();
        loop.runTo(160);
        loop.agent.onClose();

        List<JournalEntry> entries = JournalReader.readAll(file).entries();
        List<JournalEntry> out = entries.stream().filter(e -> "areaSuspended".equals(e.text("event"))).toList();
        assertThat(out).singleElement().satisfies(e -> {
            assertThat(e.text("area")).isEqualTo("area1");
            assertThat(e.fields().path("reasons").get(0).asText()).isEqualTo("frequencyUnusable:area1");
            assertThat(e.text("detail")).startsWith("frequency:area1 frozen ageMs=");
            JsonNode input = e.fields().path("inputs").get(0);
            assertThat(input.path("latestValue").asDouble()).isEqualTo(59.98);
            // frozen after 12 identical readings (the default), judged at the next cycle
            assertThat(input.path("identicalReadings").asInt()).isBetween(12, 14);
            assertThat(e.tMs() - StudyLoop.START_MS).isBetween(60_000L, 90_000L);
        });
        List<JournalEntry> back = entries.stream().filter(e -> "areaResumed".equals(e.text("event"))).toList();
        assertThat(back).singleElement().satisfies(e -> {
            assertThat(e.text("area")).isEqualTo("area1");
            assertThat(e.fields().path("after").get(0).asText()).isEqualTo("frequencyUnusable:area1");
            assertThat(e.tMs()).isGreaterThan(StudyLoop.START_MS + 120_000);
        });
        long outTMs = out.get(0).tMs();
        List<JournalEntry> decidedWhileOut = entries.stream().filter(e -> e.kind().equals(JournalFormat.KIND_DECIDED))
                .filter(e -> e.tMs() >= outTMs && e.tMs() < back.get(0).tMs()).toList();
        assertThat(decidedWhileOut).isNotEmpty().allSatisfy(e -> {
            assertThat(e.text("state")).isEqualTo("regulating");
            assertThat(e.fields().path("suspendedAreas").get(0).path("area").asText()).isEqualTo("area1");
        });
    }

    /**
     * Each decided entry says how old the data it used was and how much the intake has received and
     * missed so far. Area 2's meter is silenced from 40 s to 52 s (the tap drops its messages, the
     * area's frequency ages while held). At 60 s a copy of area 2's last reading is injected with its
     * seq 6 ahead (h + 6): a gap of 5 missing, then the meter's own h+1 … h+5 arrive out of order and
     * its h+6 is a duplicate. Everything arrives at once on the in-memory broker; message counts are
     * taken independently by a second subscriber.
     */
    @Test
    void shouldJournalTheAgeOfWhatEachCycleUsedAndTheIntakeCounters(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = journaledLoop(file);
        MessageCodec codec = new MessageCodec();
        TopicTree topics = TopicTree.forSite("two-area-textbook");
        Map<String, TreeSet<Long>> meterSeqs = new TreeMap<>();
        AreaMeter[] lastArea2 = {null};
        long[] meterCount = {0};
        long[] telemetryCount = {0};
        loop.broker.connect("witness").subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, m -> {
            if (m.topic().contains("/meter/")) {
                AreaMeter a = codec.decode(m.payload(), AreaMeter.class).message().orElseThrow();
                meterSeqs.computeIfAbsent(a.area() + "/" + a.meter(), k -> new TreeSet<>()).add(a.seq());
                meterCount[0]++;
                if (a.area().equals("area2")) {
                    lastArea2[0] = a;
                }
            } else if (m.topic().endsWith("/telemetry")) {
                codec.decode(m.payload(), UnitTelemetry.class).message().orElseThrow();
                telemetryCount[0]++;
            }
        });
        loop.runTo(40);
        loop.tap.silentAreas.add("area2");
        loop.runTo(52);
        loop.tap.silentAreas.clear();
        loop.runTo(60);
        AreaMeter h = lastArea2[0];
        AreaMeter ahead = new AreaMeter(h.seq() + 6, h.sourceTime() + 1, h.area(), h.meter(), h.frequencyHz(),
                h.frequencyQuality(), h.ties(), h.netInterchangeMw(), h.netInterchangeQuality());
        loop.broker.connect("injector").publish(org.loopstand.protocol.bus.OutboundMessage.of(
                topics.areaMeter("area2", h.meter()), codec.encode(ahead), Qos.AT_MOST_ONCE));
        loop.runTo(80);
        loop.agent.onClose();

        List<JournalEntry> decided = JournalReader.readAll(file).entries().stream()
                .filter(e -> e.kind().equals(JournalFormat.KIND_DECIDED)).toList();
        assertThat(decided).hasSizeGreaterThanOrEqualTo(19);
        List<Long> area2FrequencyAges = new ArrayList<>();
        for (JournalEntry e : decided) {
            JsonNode used = e.fields().path("used");
            double elapsedS = (e.tMs() - StudyLoop.START_MS) / 1000.0;
            JsonNode a1 = used.path("areas").path("area1");
            JsonNode a2 = used.path("areas").path("area2");
            if (elapsedS >= 8) { // meters scan every 2 s (plant default): a cycle finds data at most one scan old
                assertThat(a1.path("frequencyAgeMs").asLong()).isBetween(0L, 2000L);
                assertThat(a1.path("tieFlowAgeMs").path("tie12").asLong()).isEqualTo(a1.path("frequencyAgeMs").asLong());
                assertThat(used.path("units").path("count").asInt()).isEqualTo(2);
                long max = used.path("units").path("telemetryAgeMaxMs").asLong();
                long median = used.path("units").path("telemetryAgeMedianMs").asLong();
                assertThat(median).isBetween(0L, max); // nearest-rank median of two = the lower one
                assertThat(max).isLessThanOrEqualTo(2000L);
            }
            if (!a2.path("frequencyAgeMs").isNull() && !a2.path("frequencyAgeMs").isMissingNode()) {
                area2FrequencyAges.add(a2.path("frequencyAgeMs").asLong());
                if (elapsedS > 44 && elapsedS <= 52) {
                    // silent since 40 s: the last reading was taken at or before 40 s (held last good)
                    assertThat(a2.path("frequencyAgeMs").asLong()).isGreaterThanOrEqualTo((long) ((elapsedS - 40) * 1000));
                }
            }
        }
        assertThat(area2FrequencyAges).anyMatch(age -> age >= 10_000);

        JsonNode intake = decided.get(decided.size() - 1).fields().path("intake");
        long expectedMeters = meterCount[0];
        // seqs the witness never saw: the silence only (the injection's h+1 … h+5 arrived later)
        long silenceMissing = meterSeqs.values().stream().mapToLong(s -> s.last() - s.first() + 1 - s.size()).sum();
        assertThat(silenceMissing).isBetween(5L, 6L); // 12 s of silence at one scan per 2 s
        // the last decided entry is the 80 s cycle; readings after it are not in its counters
        JsonNode meters = intake.path("areaMeter");
        assertThat(meters.path("received").asLong()).isBetween(expectedMeters - 2, expectedMeters);
        assertThat(meters.path("seqMissing").asLong()).isEqualTo(silenceMissing + 5);
        assertThat(meters.path("seqGaps").asLong()).isEqualTo(2);
        assertThat(meters.path("duplicates").asLong()).isEqualTo(1);
        assertThat(meters.path("outOfOrder").asLong()).isEqualTo(5);
        assertThat(meters.path("rejected").asLong()).isZero();
        JsonNode tel = intake.path("unitTelemetry");
        assertThat(tel.path("received").asLong()).isBetween(telemetryCount[0] - 2, telemetryCount[0]);
        assertThat(tel.path("seqMissing").asLong()).isZero();
        assertThat(intake.path("queueFull").asLong()).isZero();
    }

    /**
     * Schema version 2, what exact replay feeds on: every message routed is an {@code input} entry (topic,
     * arrival time, payload as it came) written before what it caused; a cycle's {@code received} counter is
     * the number of input entries of the kind before it; the cycle schedule's start and each cycle's
     * monotonic start are in the journal and give its number and jitter.
     */
    @Test
    void shouldJournalEveryInputBeforeWhatItCausedAndTheCycleTimingToReplayIt(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = journaledLoop(file);
        TopicTree topics = TopicTree.forSite("two-area-textbook");
        String meterTopic = topics.areaMeter("area1", "m-injected");
        loop.runTo(30);
        var injector = loop.broker.connect("injector");
        injector.publish(org.loopstand.protocol.bus.OutboundMessage.of(meterTopic,
                "{not json".getBytes(java.nio.charset.StandardCharsets.UTF_8), Qos.AT_MOST_ONCE));
        injector.publish(org.loopstand.protocol.bus.OutboundMessage.of(meterTopic, new byte[] {(byte) 0xff, (byte) 0xfe},
                Qos.AT_MOST_ONCE));
        loop.runTo(50);
        loop.agent.onClose();

        List<JournalEntry> entries = JournalReader.readAll(file).entries();
        int text = -1;
        int binary = -1;
        for (int i = 0; i < entries.size(); i++) {
            if (meterTopic.equals(entries.get(i).text("topic")) && entries.get(i).kind().equals(InputEntries.KIND)) {
                if ("{not json".equals(entries.get(i).text("payload"))) {
                    text = i;
                } else if ("//4=".equals(entries.get(i).text("payloadBase64"))) {
                    binary = i;
                }
            }
        }
        assertThat(text).isPositive();
        assertThat(binary).isPositive();
        for (int i : new int[] {text, binary}) {
            JournalEntry input = entries.get(i);
            JournalEntry refused = entries.get(i + 1);
            assertThat(input.get("atMs").asLong()).isEqualTo(StudyLoop.START_MS + 30_000L);
            assertThat(refused.kind()).isEqualTo(JournalFormat.KIND_REFUSED);
            assertThat(refused.text("topic")).isEqualTo(meterTopic);
            assertThat(refused.tMs()).isEqualTo(input.tMs());
        }
        assertThat(InputEntries.payloadOf(entries.get(binary).fields())).containsExactly(0xff, 0xfe);

        JournalEntry clock = entries.stream().filter(e -> e.kind().equals(InputEntries.KIND_CYCLE_CLOCK)).findFirst().orElseThrow();
        long periodNs = clock.get("periodNs").asLong();
        long t0Ns = clock.get("t0Ns").asLong();
        assertThat(periodNs).isEqualTo(loop.agent.cycle().settings().cycleMs() * 1_000_000L);
        long meterInputs = 0;
        long cycles = 0;
        for (JournalEntry e : entries) {
            if (e.kind().equals(InputEntries.KIND) && e.text("topic").contains("/meter/")) {
                meterInputs++;
            } else if (e.kind().equals(JournalFormat.KIND_DECIDED)) {
                cycles++;
                assertThat(e.fields().path("intake").path("areaMeter").path("received").asLong()).isEqualTo(meterInputs);
                long scheduledNs = t0Ns + e.get("cycle").asLong() * periodNs;
                assertThat(e.get("jitterUs").asLong()).isEqualTo((e.get("pollNs").asLong() - scheduledNs) / 1000);
            }
        }
        assertThat(cycles).isEqualTo(loop.agent.cyclesRun()).isGreaterThanOrEqualTo(12);
        assertThat(meterInputs).isGreaterThan(40); // two meters every 2 s for 50 s, and the two injected
    }
}
