package org.loopstand.protocol.journal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.time.VirtualClock;

class JournalWriterTest {
    private static final long START_MS = 1_700_000_000_000L;

    record Decision(String unit, double aceMw, int pulseMs) {
    }

    @TempDir
    Path dir;

    @Test
    void shouldWriteHeaderEntriesAndEndThatReadBack() throws Exception {
        VirtualClock wall = new VirtualClock(0);
        Path file = dir.resolve("controller.jsonl");
        try (JournalWriter w = JournalWriter.create(file, "controller", START_MS, Map.of("site", "demo-site"), wall,
                Duration.ofSeconds(1))) {
            w.append(START_MS + 4000, JournalFormat.KIND_DECIDED, new Decision("u1", -12.5, 800));
            w.append(START_MS + 4001, JournalFormat.KIND_REFUSED, Map.of("unit", "u2", "reason", "atLimit"));
            w.close(START_MS + 8000, EndReason.COMPLETED);
        }
        List<String> lines = Files.readAllLines(file);
        assertThat(lines).hasSize(4);
        assertThat(lines.get(0)).isEqualTo(
                "{\"journal\":\"loopstand\",\"schemaVersion\":2,\"process\":\"controller\",\"startedAt\":1700000000000,\"site\":\"demo-site\"}");
        assertThat(lines.get(1)).isEqualTo(
                "{\"t\":1700000004000,\"kind\":\"decided\",\"unit\":\"u1\",\"aceMw\":-12.5,\"pulseMs\":800}");
        assertThat(lines.get(3)).isEqualTo("{\"t\":1700000008000,\"kind\":\"end\",\"reason\":\"completed\",\"entries\":2}");

        JournalReader.Contents c = JournalReader.readAll(file);
        assertThat(c.entries()).extracting(JournalEntry::kind).containsExactly("decided", "refused");
        assertThat(c.entries().get(1).text("reason")).isEqualTo("atLimit");
        assertThat(c.summary().cutShort()).isFalse();
        assertThat(c.summary().endReason()).contains(EndReason.COMPLETED);
        assertThat(c.summary().tornTail()).isFalse();
        assertThat(c.summary().header().orElseThrow().get("site").asText()).isEqualTo("demo-site");
    }

    @Test
    void shouldHoldLinesInMemoryUntilTheFlushIntervalHasPassedOnTheFlushClock() throws Exception {
        VirtualClock wall = new VirtualClock(0);
        Path file = dir.resolve("plant.jsonl");
        JournalWriter w = JournalWriter.create(file, "plant", START_MS, Map.of(), wall, Duration.ofSeconds(1));
        long headerBytes = Files.size(file);
        assertThat(headerBytes).isPositive(); // the header is flushed at once

        w.append(START_MS + 20, JournalFormat.KIND_TRUTH, Map.of("frequencyHz", 49.98));
        wall.advanceMillis(999);
        assertThat(w.flushIfDue()).isFalse();
        assertThat(Files.size(file)).isEqualTo(headerBytes);
        assertThat(w.entriesFlushed()).isZero();

        wall.advanceMillis(1);
        assertThat(w.flushIfDue()).isTrue();
        assertThat(Files.size(file)).isGreaterThan(headerBytes);
        assertThat(w.entriesFlushed()).isEqualTo(1);
        w.close();
        assertThat(JournalReader.readAll(file).summary().endReason()).contains(EndReason.STOPPED);
    }

    @Test
    void shouldRefuseReservedNamesBadKindsAndAnExistingFile() throws Exception {
        VirtualClock wall = new VirtualClock(0);
        Path file = dir.resolve("plant.jsonl");
        try (JournalWriter w = JournalWriter.create(file, "plant", START_MS, wall)) {
            assertThatThrownBy(() -> w.append(START_MS, "event", Map.of("t", 3)))
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("'t' is reserved");
            assertThatThrownBy(() -> w.append(START_MS, "Bad Kind", Map.of()))
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("Bad Kind");
            assertThatThrownBy(() -> w.append(START_MS, "end", Map.of()))
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("close()");
            assertThatThrownBy(() -> w.append(START_MS, "event", List.of(1, 2)))
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("JSON object");
        }
        assertThatThrownBy(() -> JournalWriter.create(file, "plant", START_MS, wall))
                .hasMessageContaining("cannot create journal");
    }

    @Test
    void shouldWriteImmutableMapsAndSetsInKeyOrderAndKeepTheOrderOfOtherMaps() throws Exception {
        // Map.of / Set.of iterate in an order that changes from one JVM to the next: journals write them sorted,
        // so a lockstep run is byte-identical in every JVM; a map filled in order keeps its order
        Path file = dir.resolve("plant.jsonl");
        Map<String, Object> filled = new java.util.LinkedHashMap<>();
        filled.put("zulu", Map.of("flowMw", 1.5, "band", "held", "aceMw", -2.0));
        filled.put("alpha", java.util.Set.of("north", "east", "south"));
        filled.put("list", List.of("c", "a", "b"));
        try (JournalWriter w = JournalWriter.create(file, "plant", START_MS, new VirtualClock(0))) {
            w.append(START_MS, JournalFormat.KIND_EVENT, filled);
        }
        assertThat(Files.readAllLines(file).get(1)).isEqualTo("{\"t\":1700000000000,\"kind\":\"event\","
                + "\"zulu\":{\"aceMw\":-2.0,\"band\":\"held\",\"flowMw\":1.5},\"alpha\":[\"east\",\"north\",\"south\"],"
                + "\"list\":[\"c\",\"a\",\"b\"]}");
    }
}
