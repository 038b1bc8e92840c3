package org.loopstand.protocol.journal;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.BufferedInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.function.Consumer;

/**
 * Reads a journal written by {@link JournalWriter}, tolerating what a killed process leaves behind.
 *
 * <p>A line counts only when it ends with a newline and parses as a JSON object with {@code t} and
 * {@code kind}. An incomplete or unparseable <em>last</em> line is a torn tail: reported with its byte
 * offset and ignored. An unreadable line before the last is reported in
 * {@link JournalSummary#damagedLines()} and skipped. A journal without an {@code end} entry is
 * {@linkplain JournalSummary#cutShort() cut short}. A header of another format or a newer schema
 * version is refused with an error naming the file.
 */
public final class JournalReader {
    private static final ObjectMapper MAPPER = JournalFormat.newMapper();

    private JournalReader() {
    }

    /** Result of {@link #readAll}: the entries in file order and the summary. */
    public record Contents(List<JournalEntry> entries, JournalSummary summary) {
    }

    /**
     * Reads the whole journal into memory.
     *
     * @param file a journal file
     * @return entries (header and end excluded) and summary
     */
    public static Contents readAll(Path file) {
        List<JournalEntry> entries = new ArrayList<>();
        JournalSummary summary = stream(file, entries::add);
        return new Contents(List.copyOf(entries), summary);
    }

    /**
     * Streams entries (header and end excluded) to {@code consumer} in file order.
     *
     * @param file     a journal file
     * @param consumer receives each accepted entry
     * @return the summary
     * @throws UncheckedIOException on read errors
     * @throws IllegalArgumentException when the header is not a Loopstand journal header this code reads
     */
    public static JournalSummary stream(Path file, Consumer<JournalEntry> consumer) {
        try (InputStream in = new BufferedInputStream(Files.newInputStream(file), 64 * 1024)) {
            return new Pass(file, consumer).run(in);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read journal " + file + ": " + e.getMessage(), e);
        }
    }

    /** One reading pass; holds the state so that a line is judged only once the next is known. */
    private static final class Pass {
        private final Path file;
        private final Consumer<JournalEntry> consumer;
        private ObjectNode header;
        private JournalEntry end;
        private long accepted;
        private long lastTimeMs = -1;
        private final List<JournalDamage> damaged = new ArrayList<>();

        Pass(Path file, Consumer<JournalEntry> consumer) {
            this.file = file;
            this.consumer = consumer;
        }

        JournalSummary run(InputStream in) throws IOException {
            ByteArrayOutputStream line = new ByteArrayOutputStream(512);
            long offset = 0;
            long lineStart = 0;
            long lineNumber = 0;
            // A bad complete line is held back: if it turns out to be the last line it is a torn tail.
            JournalDamage pendingBad = null;
            int b;
            while ((b = in.read()) != -1) {
                offset++;
                if (b != '\n') {
                    line.write(b);
                    continue;
                }
                lineNumber++;
                if (pendingBad != null) {
                    damaged.add(pendingBad);
                    pendingBad = null;
                }
                String problem = accept(line.toByteArray(), lineNumber);
                if (problem != null) {
                    pendingBad = new JournalDamage(lineNumber, lineStart, problem);
                }
                line.reset();
                lineStart = offset;
            }
            boolean torn = false;
            long tornOffset = -1;
            if (line.size() > 0) {
                if (pendingBad != null) {
                    damaged.add(pendingBad);
                }
                torn = true;
                tornOffset = lineStart;
            } else if (pendingBad != null) {
                torn = true;
                tornOffset = pendingBad.offsetBytes();
            }
            return new JournalSummary(Optional.ofNullable(header), accepted, Optional.ofNullable(end), torn,
                    tornOffset, List.copyOf(damaged), lastTimeMs);
        }

        /** @return null when accepted, else what is wrong */
        private String accept(byte[] bytes, long lineNumber) {
            if (bytes.length == 0) {
                return "empty line";
            }
            JsonNode node;
            try {
                node = MAPPER.readTree(bytes);
            } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
                return "not JSON: " + e.getOriginalMessage();
            } catch (IOException e) {
                return "not readable: " + e.getMessage();
            }
            if (node == null || !node.isObject()) {
                return "not a JSON object";
            }
            ObjectNode obj = (ObjectNode) node;
            if (header == null && lineNumber == 1) {
                checkHeader(obj);
                header = obj;
                lastTimeMs = obj.path("startedAt").asLong(-1);
                return null;
            }
            if (header == null) {
                return "entry before a header";
            }
            JsonNode t = obj.get(JournalFormat.FIELD_TIME);
            JsonNode kind = obj.get(JournalFormat.FIELD_KIND);
            if (t == null || !t.canConvertToLong() || kind == null || !kind.isTextual()) {
                return "missing 't' (epoch ms) or 'kind'";
            }
            JournalEntry entry = new JournalEntry(t.asLong(), kind.asText(), obj, lineNumber);
            if (entry.isEnd()) {
                end = entry;
                return null;
            }
            if (end != null) {
                return "entry after the end entry";
            }
            accepted++;
            lastTimeMs = entry.tMs();
            consumer.accept(entry);
            return null;
        }

        private void checkHeader(ObjectNode obj) {
            if (!JournalFormat.MAGIC.equals(obj.path("journal").asText(null))) {
                throw new IllegalArgumentException(file + " is not a Loopstand journal: first line has no \"journal\":\""
                        + JournalFormat.MAGIC + "\"");
            }
            int version = obj.path("schemaVersion").asInt(-1);
            if (version < 1 || version > JournalFormat.SCHEMA_VERSION) {
                throw new IllegalArgumentException(file + " has journal schemaVersion " + obj.get("schemaVersion")
                        + "; this build reads 1.." + JournalFormat.SCHEMA_VERSION);
            }
        }
    }
}
