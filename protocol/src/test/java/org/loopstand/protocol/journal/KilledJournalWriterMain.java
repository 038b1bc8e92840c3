package org.loopstand.protocol.journal;

import java.nio.file.Path;
import java.time.Duration;
import java.util.Map;
import org.loopstand.protocol.time.WallClock;

/**
 * Child process for {@link JournalKillTest}: appends entries until killed (bounded to 60 s and
 * 200,000 entries), flushing every second of wall time, and prints {@code flushed <n>} after each flush.
 */
public final class KilledJournalWriterMain {
    private KilledJournalWriterMain() {
    }

    public static void main(String[] args) throws Exception {
        Path file = Path.of(args[0]);
        WallClock wall = WallClock.INSTANCE;
        JournalWriter w = JournalWriter.create(file, "plant", wall.epochMillis(), Map.of(), wall, Duration.ofSeconds(1));
        long deadline = wall.monotonicNanos() + 60_000_000_000L;
        for (int i = 0; i < 200_000 && wall.monotonicNanos() < deadline; i++) {
            w.append(wall.epochMillis(), "truth", Map.of("i", i, "frequencyHz", 50.0 + (i % 7) * 0.001,
                    "padding", "xxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx"));
            if (w.entriesFlushed() == i + 1) {
                System.out.println("flushed " + w.entriesFlushed());
                System.out.flush();
            }
            Thread.sleep(1);
        }
        w.close();
    }
}
