package org.loopstand.report.csv;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalSummary;

/**
 * Turns a run journal into CSV for spreadsheet users (RFC 4180: comma separated, CRLF line ends,
 * fields with a comma, quote or line break in double quotes, quotes doubled).
 *
 * <p>Columns: {@code t} (scenario epoch ms), {@code time} (the same as ISO-8601 UTC), {@code kind},
 * then every field found in the exported entries, in order of first appearance. Nested objects
 * flatten with dots ({@code frequencyQuality.validity}), arrays with indexes ({@code ties[0].flowMw}).
 * A field an entry lacks is an empty cell. The journal is read twice (columns, then rows), so memory
 * does not grow with its length. A torn tail or a cut-short journal is reported in the returned summary.
 */
public final class CsvExporter {
    private static final String CRLF = "\r\n";

    private CsvExporter() {
    }

    /**
     * What an export wrote.
     *
     * @param rows    data rows written (header excluded)
     * @param columns the header
     * @param journal the reader's summary of the journal (torn tail, cut short)
     */
    public record Export(long rows, List<String> columns, JournalSummary journal) {
    }

    /** Exports every entry of the journal. */
    public static Export export(Path journal, Path out) {
        return export(journal, null, out);
    }

    /**
     * Exports the entries of one kind.
     *
     * @param journal a journal file
     * @param kind    the kind to export ({@code truth}, {@code sent}, …), or null for all
     * @param out     the CSV file to write (replaced if it exists)
     * @return what was written
     */
    public static Export export(Path journal, String kind, Path out) {
        Set<String> columns = new LinkedHashSet<>(List.of("t", "time", "kind"));
        JournalReader.stream(journal, e -> {
            if (kind == null || kind.equals(e.kind())) {
                columns.addAll(flatten(e).keySet());
            }
        });
        List<String> header = List.copyOf(columns);
        long[] rows = {0};
        JournalSummary summary;
        try (Writer w = new BufferedWriter(Files.newBufferedWriter(out, StandardCharsets.UTF_8))) {
            writeRow(w, header);
            summary = JournalReader.stream(journal, e -> {
                if (kind != null && !kind.equals(e.kind())) {
                    return;
                }
                Map<String, String> cells = flatten(e);
                List<String> row = new ArrayList<>(header.size());
                for (String c : header) {
                    row.add(cells.getOrDefault(c, ""));
                }
                try {
                    writeRow(w, row);
                } catch (IOException ex) {
                    throw new UncheckedIOException(ex);
                }
                rows[0]++;
            });
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write CSV " + out + ": " + e.getMessage(), e);
        }
        return new Export(rows[0], header, summary);
    }

    /** @return the entry's cells by column name (t, time, kind, then flattened fields) */
    static Map<String, String> flatten(JournalEntry e) {
        Map<String, String> cells = new LinkedHashMap<>();
        cells.put("t", Long.toString(e.tMs()));
        cells.put("time", Instant.ofEpochMilli(e.tMs()).toString());
        cells.put("kind", e.kind());
        Iterator<Map.Entry<String, JsonNode>> it = e.fields().fields();
        while (it.hasNext()) {
            Map.Entry<String, JsonNode> f = it.next();
            if (!f.getKey().equals("t") && !f.getKey().equals("kind")) {
                flattenInto(cells, f.getKey(), f.getValue());
            }
        }
        return cells;
    }

    private static void flattenInto(Map<String, String> cells, String name, JsonNode node) {
        if (node.isObject()) {
            Iterator<Map.Entry<String, JsonNode>> it = node.fields();
            if (!it.hasNext()) {
                cells.put(name, "");
            }
            while (it.hasNext()) {
                Map.Entry<String, JsonNode> f = it.next();
                flattenInto(cells, name + "." + f.getKey(), f.getValue());
            }
        } else if (node.isArray()) {
            if (node.isEmpty()) {
                cells.put(name, "");
            }
            for (int i = 0; i < node.size(); i++) {
                flattenInto(cells, name + "[" + i + "]", node.get(i));
            }
        } else if (node.isNull()) {
            cells.put(name, "");
        } else {
            cells.put(name, node.asText());
        }
    }

    private static void writeRow(Writer w, List<String> cells) throws IOException {
        for (int i = 0; i < cells.size(); i++) {
            if (i > 0) {
                w.write(',');
            }
            w.write(quote(cells.get(i)));
        }
        w.write(CRLF);
    }

    /** @return the cell quoted per RFC 4180 when it needs to be */
    static String quote(String cell) {
        if (cell.indexOf(',') < 0 && cell.indexOf('"') < 0 && cell.indexOf('\n') < 0 && cell.indexOf('\r') < 0) {
            return cell;
        }
        return '"' + cell.replace("\"", "\"\"") + '"';
    }
}
