package org.loopstand.protocol.journal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class JournalReaderTest {
    private static final String HEADER =
            "{\"journal\":\"loopstand\",\"schemaVersion\":1,\"process\":\"plant\",\"startedAt\":1000}\n";
    private static final String E1 = "{\"t\":1020,\"kind\":\"truth\",\"frequencyHz\":50.01}\n";
    private static final String E2 = "{\"t\":1040,\"kind\":\"truth\",\"frequencyHz\":50.02}\n";

    @TempDir
    Path dir;

    private Path write(String name, String content) throws Exception {
        Path p = dir.resolve(name);
        Files.writeString(p, content, StandardCharsets.UTF_8, StandardOpenOption.CREATE_NEW);
        return p;
    }

    @Test
    void shouldAcceptEverythingUpToATornLastLineAndGiveItsOffset() throws Exception {
        Path p = write("plant.jsonl", HEADER + E1 + E2 + "{\"t\":1060,\"kind\":\"tru");
        JournalReader.Contents c = JournalReader.readAll(p);
        assertThat(c.entries()).extracting(JournalEntry::tMs).containsExactly(1020L, 1040L);
        assertThat(c.summary().tornTail()).isTrue();
        // The torn line starts right after the last newline: header + two entries, all ASCII.
        assertThat(c.summary().tornTailOffsetBytes()).isEqualTo((HEADER + E1 + E2).length());
        assertThat(c.summary().cutShort()).isTrue();
        assertThat(c.summary().lastEntryTimeMs()).isEqualTo(1040L);
        assertThat(c.summary().describe()).contains("CUT SHORT").contains("torn last line at byte");
    }

    @Test
    void shouldTreatAnUnparseableLastLineAsATornTail() throws Exception {
        Path p = write("plant.jsonl", HEADER + E1 + "{\"t\":10\u0000garbage}\n");
        JournalSummary s = JournalReader.readAll(p).summary();
        assertThat(s.entriesAccepted()).isEqualTo(1);
        assertThat(s.tornTail()).isTrue();
        assertThat(s.tornTailOffsetBytes()).isEqualTo((HEADER + E1).length());
        assertThat(s.damagedLines()).isEmpty();
    }

    @Test
    void shouldReportADamagedMiddleLineAndKeepReading() throws Exception {
        Path p = write("plant.jsonl", HEADER + E1 + "not json\n" + E2
                + "{\"t\":2000,\"kind\":\"end\",\"reason\":\"completed\"}\n");
        JournalReader.Contents c = JournalReader.readAll(p);
        assertThat(c.entries()).hasSize(2);
        assertThat(c.summary().damagedLines()).singleElement()
                .satisfies(d -> {
                    assertThat(d.lineNumber()).isEqualTo(3);
                    assertThat(d.offsetBytes()).isEqualTo((HEADER + E1).length());
                });
        assertThat(c.summary().tornTail()).isFalse();
        assertThat(c.summary().cutShort()).isFalse();
    }

    @Test
    void shouldCallAJournalWithNoCompleteHeaderCutShort() throws Exception {
        Path p = write("plant.jsonl", "{\"journal\":\"loopst");
        JournalSummary s = JournalReader.readAll(p).summary();
        assertThat(s.header()).isEmpty();
        assertThat(s.cutShort()).isTrue();
        assertThat(s.tornTailOffsetBytes()).isZero();
    }

    @Test
    void shouldRefuseAForeignFileAndANewerSchema() throws Exception {
        Path foreign = write("a.jsonl", "{\"hello\":1}\n");
        assertThatThrownBy(() -> JournalReader.readAll(foreign)).hasMessageContaining("not a Loopstand journal");
        Path newer = write("b.jsonl", "{\"journal\":\"loopstand\",\"schemaVersion\":3,\"process\":\"x\",\"startedAt\":0}\n");
        assertThatThrownBy(() -> JournalReader.readAll(newer)).hasMessageContaining("schemaVersion 3");
    }
}
