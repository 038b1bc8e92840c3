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
import org.loopstand.protocol.message.UnitCommand;

/**
 * The controller's journal read back: every command sent is a {@code sent} entry (the command's kind
 * goes in {@code commandKind}, never in the reserved {@code kind} field, which once made the writer
 * throw on the first command), every accepted ack a {@code received} entry, every cycle a
 * {@code decided} entry, and the file ends cleanly.
 */
class ControllerJournalTest {
    @Test
    void shouldJournalEveryCommandSentAndReadItBack(@TempDir Path dir) {
        Path file = dir.resolve("controller.jsonl");
        StudyLoop loop = new StudyLoop(new GridSimulator(ClosedLoopStudyTest.twoAreaGrid()),
                ClosedLoopStudyTest.twoAreaController("tieLineBias"), List.of(),
                JournalWriter.create(file, "controller", StudyLoop.START_MS, new org.loopstand.protocol.time.VirtualClock(0)));
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
}
