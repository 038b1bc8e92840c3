package org.loopstand.report.csv;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CsvExporterTest {
    @TempDir
    Path dir;

    private Path journal() throws Exception {
        Path p = dir.resolve("controller.jsonl");
        Files.writeString(p, String.join("\n",
                "{\"journal\":\"loopstand\",\"schemaVersion\":1,\"process\":\"controller\",\"startedAt\":0}",
                "{\"t\":1000,\"kind\":\"received\",\"frequencyHz\":59.98,\"quality\":{\"validity\":\"good\",\"flags\":[]}}",
                "{\"t\":2000,\"kind\":\"refused\",\"unit\":\"g1\",\"detail\":\"said \\\"no\\\", twice\\nthen stopped\"}",
                "{\"t\":3000,\"kind\":\"received\",\"frequencyHz\":59.99,\"ties\":[{\"tie\":\"t1\",\"flowMw\":-12.5}]}",
                "{\"t\":4000,\"kind\":\"rec") /* torn */, StandardCharsets.UTF_8);
        return p;
    }

    @Test
    void shouldWriteOneKindWithFlattenedColumnsAndEmptyCellsForMissingFields() throws Exception {
        Path out = dir.resolve("received.csv");
        CsvExporter.Export e = CsvExporter.export(journal(), "received", out);
        assertThat(e.rows()).isEqualTo(2);
        assertThat(e.journal().tornTail()).isTrue();
        assertThat(e.journal().cutShort()).isTrue();
        assertThat(Files.readString(out)).isEqualTo(
                "t,time,kind,frequencyHz,quality.validity,quality.flags,ties[0].tie,ties[0].flowMw\r\n"
                        + "1000,1970-01-01T00:00:01Z,received,59.98,good,,,\r\n"
                        + "3000,1970-01-01T00:00:03Z,received,59.99,,,t1,-12.5\r\n");
    }

    @Test
    void shouldQuoteCommasQuotesAndLineBreaksPerRfc4180() throws Exception {
        // RFC 4180 §2: fields with commas, double quotes or line breaks are enclosed in double quotes,
        // and a double quote inside is escaped by preceding it with another double quote.
        Path out = dir.resolve("refused.csv");
        CsvExporter.export(journal(), "refused", out);
        assertThat(Files.readString(out)).isEqualTo("t,time,kind,unit,detail\r\n"
                + "2000,1970-01-01T00:00:02Z,refused,g1,\"said \"\"no\"\", twice\nthen stopped\"\r\n");
        assertThat(CsvExporter.quote("plain")).isEqualTo("plain");
    }

    @Test
    void shouldExportEveryKindWhenNoneIsGiven() throws Exception {
        Path out = dir.resolve("all.csv");
        CsvExporter.Export e = CsvExporter.export(journal(), out);
        assertThat(e.rows()).isEqualTo(3);
        assertThat(e.columns()).containsExactly("t", "time", "kind", "frequencyHz", "quality.validity", "quality.flags",
                "unit", "detail", "ties[0].tie", "ties[0].flowMw");
    }
}
