package org.loopstand.protocol.journal;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;

import com.fasterxml.jackson.annotation.JsonValue;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.time.VirtualClock;

class QueuedJournalTest {
    @TempDir
    Path dir;
    final VirtualClock flushClock = new VirtualClock(1_700_000_000_000L);
    final ObjectMapper mapper = new ObjectMapper();

    List<JsonNode> lines(Path file) throws Exception {
        return Files.readAllLines(file, StandardCharsets.UTF_8).stream().map(l -> {
            try {
                return mapper.readTree(l);
            } catch (Exception e) {
                throw new IllegalStateException(e);
            }
        }).toList();
    }

    @Test
    void shouldWriteEveryEntryInOrderOnItsOwnThreadAndJournalTheQueueFiguresAtClose() throws Exception {
        Path file = dir.resolve("plant.jsonl");
        QueuedJournal q = new QueuedJournal(JournalWriter.create(file, "plant", 1_000, flushClock), 64, "test-journal");
        for (int i = 0; i < 1_000; i++) {
            q.append(1_000 + i, "sent", Map.of("seq", i)); // never waits for the writer thread
        }
        q.close(5_000, EndReason.COMPLETED);
        List<JsonNode> lines = lines(file);
        JsonNode figures = lines.get(lines.size() - 2);
        long queued = figures.get("queued").asLong();
        long dropped = figures.get("dropped").asLong();
        assertThat(queued + dropped).isEqualTo(1_000); // every append either written or counted
        assertThat(lines).hasSize((int) (1 + queued + 2)); // header, the entries written, journalQueue, end
        // the entries that were written keep their order
        List<Integer> seqs = lines.subList(1, lines.size() - 2).stream().map(n -> n.get("seq").asInt()).toList();
        assertThat(seqs).isSorted();
        assertThat(figures.get("event").asText()).isEqualTo(QueuedJournal.QUEUE_EVENT);
        assertThat(figures.get("capacity").asInt()).isEqualTo(64);
        assertThat(figures.get("writeFailed").asLong()).isZero();
        assertThat(lines.get(lines.size() - 1).get("kind").asText()).isEqualTo("end");
        assertThat(lines.get(lines.size() - 1).get("reason").asText()).isEqualTo("completed");
    }

    /** Fields whose serialization waits: holds the writer thread so the queue fills. */
    static final class Slow {
        final CountDownLatch entered = new CountDownLatch(1);
        final CountDownLatch release = new CountDownLatch(1);

        @JsonValue
        Map<String, Object> value() throws InterruptedException {
            entered.countDown();
            release.await(10, TimeUnit.SECONDS);
            return Map.of("slow", true);
        }
    }

    @Test
    void shouldDropEntriesBeyondItsCapacityAndCountThemByKind() throws Exception {
        Path file = dir.resolve("plant.jsonl");
        QueuedJournal q = new QueuedJournal(JournalWriter.create(file, "plant", 1_000, flushClock), 4, "test-journal");
        Slow slow = new Slow();
        q.append(1_000, "event", slow);
        assertThat(slow.entered.await(10, TimeUnit.SECONDS)).isTrue(); // the writer thread is busy with it
        for (int i = 0; i < 4; i++) {
            q.append(1_001 + i, "sent", Map.of("seq", i));
        }
        q.append(1_010, "sent", Map.of("seq", 10));
        q.append(1_011, "received", Map.of("seq", 11));
        q.append(1_012, "sent", Map.of("seq", 12));
        assertThat(q.dropped()).isEqualTo(3);
        slow.release.countDown();
        q.close(2_000, EndReason.COMPLETED);
        List<JsonNode> lines = lines(file);
        assertThat(lines).hasSize(1 + 5 + 2);
        assertThat(lines.subList(2, 6)).extracting(n -> n.get("seq").asInt()).containsExactly(0, 1, 2, 3);
        JsonNode figures = lines.get(6);
        assertThat(figures.get("queued").asLong()).isEqualTo(5);
        assertThat(figures.get("dropped").asLong()).isEqualTo(3);
        assertThat(figures.get("droppedByKind").get("sent").asLong()).isEqualTo(2);
        assertThat(figures.get("droppedByKind").get("received").asLong()).isEqualTo(1);
        assertThat(figures.get("mostWaiting").asInt()).isEqualTo(4);
        assertThat(lines.get(7).get("entries").asLong()).isEqualTo(6); // five entries and the figures
    }
}
