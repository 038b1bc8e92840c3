package org.loopstand.protocol.journal;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicInteger;
import org.awaitility.Awaitility;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A writer killed with SIGKILL leaves a journal the reader accepts up to its last complete line. */
class JournalKillTest {
    @TempDir
    Path dir;

    @Test
    void shouldKeepEveryFlushedEntryWhenTheWriterIsKilled() throws Exception {
        Path file = dir.resolve("plant.jsonl");
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process child = new ProcessBuilder(java, "-Xmx64m", "-cp", System.getProperty("java.class.path"),
                KilledJournalWriterMain.class.getName(), file.toString())
                .redirectError(ProcessBuilder.Redirect.DISCARD)
                .start();
        AtomicLong lastFlushed = new AtomicLong();
        AtomicInteger flushes = new AtomicInteger();
        Thread pump = new Thread(() -> {
            try (BufferedReader r = new BufferedReader(new InputStreamReader(child.getInputStream(), StandardCharsets.UTF_8))) {
                String line;
                while ((line = r.readLine()) != null) {
                    if (line.startsWith("flushed ")) {
                        lastFlushed.set(Long.parseLong(line.substring(8)));
                        flushes.incrementAndGet();
                    }
                }
            } catch (Exception ignored) {
                // the pipe closes when the child dies
            }
        });
        pump.setDaemon(true);
        pump.start();
        try {
            // Two flushes seen ≈ 2 s of wall time; kill in the middle of the next interval.
            Awaitility.await().atMost(Duration.ofSeconds(30)).until(() -> flushes.get() >= 2);
            Awaitility.await().pollDelay(Duration.ofMillis(500)).atMost(Duration.ofSeconds(2)).until(() -> true);
        } finally {
            child.destroyForcibly(); // SIGKILL on Linux
            assertThat(child.waitFor(20, TimeUnit.SECONDS)).isTrue();
        }
        pump.join(5_000);
        long flushedBeforeKill = lastFlushed.get();

        JournalReader.Contents c = JournalReader.readAll(file);
        assertThat(flushedBeforeKill).isPositive();
        assertThat(c.summary().entriesAccepted()).isGreaterThanOrEqualTo(flushedBeforeKill);
        assertThat(c.summary().cutShort()).isTrue();
        assertThat(c.summary().damagedLines()).isEmpty();
        assertThat(c.summary().header()).isPresent();
        // Entries are consecutive from 0: nothing before the last accepted line was lost.
        for (int i = 0; i < c.entries().size(); i++) {
            assertThat(c.entries().get(i).get("i").asInt()).isEqualTo(i);
        }
    }
}
