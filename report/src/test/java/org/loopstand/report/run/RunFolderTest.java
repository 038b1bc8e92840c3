package org.loopstand.report.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.report.model.TimeSeries;

class RunFolderTest {
    @TempDir
    Path dir;

    @Test
    void shouldReadEveryJournalAndTellWhichWasCutShort() {
        VirtualClock wall = new VirtualClock(0);
        try (JournalWriter plant = JournalWriter.create(dir.resolve("plant.jsonl"), "plant", 1000, wall)) {
            plant.append(1020, "truth", Map.of("area", "north", "frequencyHz", 59.99));
            plant.append(1020, "truth", Map.of("area", "south", "frequencyHz", 59.98));
            plant.append(1040, "truth", Map.of("area", "north", "frequencyHz", 59.97));
            plant.close(1060, EndReason.COMPLETED);
        }
        JournalWriter controller = JournalWriter.create(dir.resolve("controller.jsonl"), "controller", 1000, wall);
        controller.append(1030, "decided", Map.of("aceMw", -4.0));
        controller.flush(); // and never closed: as if killed

        RunFolder run = RunFolder.read(dir);
        assertThat(run.journals()).containsOnlyKeys("controller", "plant");
        assertThat(run.cutShort()).isTrue();
        assertThat(run.problems()).singleElement().asString().startsWith("controller.jsonl: ").contains("CUT SHORT");
        assertThat(run.startedAtMs()).isEqualTo(1000);
        assertThat(run.endedAtMs()).isEqualTo(1060);
        TimeSeries north = run.series("plant", "truth", e -> "north".equals(e.text("area")), "frequencyHz",
                "frequency north", "Hz");
        assertThat(north.tMs()).containsExactly(1020, 1040);
        assertThat(north.values()).containsExactly(59.99, 59.97);
        controller.close();
    }
}
