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

    @Test
    void shouldSkipAndListFilesTheRigDidNotWriteInsteadOfFailing() throws Exception {
        VirtualClock wall = new VirtualClock(0);
        try (JournalWriter plant = JournalWriter.create(dir.resolve("plant.jsonl"), "plant", 1000, wall)) {
            plant.append(1020, "truth", Map.of("area", "north", "frequencyHz", 59.99));
            plant.close(1060, EndReason.COMPLETED);
        }
        // a controller team's own files beside the rig's: a JSON Lines log, a note, a text log
        java.nio.file.Files.writeString(dir.resolve("our-controller.jsonl"), "{\"level\":\"info\",\"msg\":\"cycle 1\"}\n");
        java.nio.file.Files.writeString(dir.resolve("notes.txt"), "rehearsal with the new bias\n");
        java.nio.file.Files.writeString(dir.resolve("controller.log"), "started\n");
        java.nio.file.Files.writeString(dir.resolve("broken.jsonl"), "not json at all\n");

        RunFolder run = RunFolder.read(dir);
        assertThat(run.journals()).containsOnlyKeys("plant");
        assertThat(run.skipped()).containsExactly(
                "broken.jsonl: not a Loopstand journal (its first line is not a journal header)",
                "notes.txt: not a file the rig writes",
                "our-controller.jsonl: not a Loopstand journal (" + dir.resolve("our-controller.jsonl")
                        + " is not a Loopstand journal: first line has no \"journal\":\"loopstand\")");
        assertThat(run.cutShort()).isFalse();
    }

    @Test
    void shouldMergeTheJournalsOfUnitProcessesIntoThePlantSideByTime() {
        VirtualClock wall = new VirtualClock(0);
        try (JournalWriter plant = JournalWriter.create(dir.resolve("plant.jsonl"), "plant", 1000, wall);
                JournalWriter unit = JournalWriter.create(dir.resolve("unit-gas-2.jsonl"), "unit-gas-2", 1000, wall);
                JournalWriter controller = JournalWriter.create(dir.resolve("controller.jsonl"), "controller", 1000, wall)) {
            plant.append(1010, "command", Map.of("unit", "steam-1", "outcome", "accepted"));
            unit.append(1005, "command", Map.of("unit", "gas-2", "outcome", "rejected", "reason", "expired"));
            unit.append(1030, "event", Map.of("event", "watchdog", "unit", "gas-2"));
            controller.append(1020, "decided", Map.of("aceMw", -4.0));
            plant.append(1030, "truth", Map.of("area", "north", "frequencyHz", 59.99));
            plant.close(1060, EndReason.COMPLETED);
            unit.close(1050, EndReason.STOPPED);
            controller.close(1060, EndReason.COMPLETED);
        }

        RunFolder run = RunFolder.read(dir);
        assertThat(run.journals()).containsOnlyKeys("controller", "plant", "unit-gas-2");
        assertThat(run.plantSideEntries()).extracting(e -> e.tMs() + " " + e.kind())
                .containsExactly("1005 command", "1010 command", "1030 truth", "1030 event");
    }
}
