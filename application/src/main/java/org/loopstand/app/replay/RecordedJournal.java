package org.loopstand.app.replay;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.loopstand.controller.runtime.InputEntries;
import org.loopstand.protocol.journal.JournalDamage;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalSummary;

/**
 * A run folder's controller journal, read and checked for what a replay needs: a controller journal of
 * schema version {@value JournalFormat#FIRST_REPLAYABLE_VERSION} or later (earlier ones hold no inputs),
 * no damaged line, input entries with topic, arrival time and payload, and before the first cycle the
 * start of the cycle schedule. Every refusal names the file and line.
 *
 * @param file         the journal file
 * @param header       its header line
 * @param entries      every entry in file order, the closing {@code end} entry included when there is one
 * @param siteId       the site the controller ran for
 * @param controllerId the controller's id
 * @param startedAtMs  controller time at start, epoch ms
 */
record RecordedJournal(Path file, ObjectNode header, List<JournalEntry> entries, String siteId, String controllerId,
                       long startedAtMs) {
    static final String FILE_NAME = "controller.jsonl";

    /**
     * @param run a run folder
     * @throws ReplayRefused when it is no run folder or its controller journal cannot be replayed
     */
    static RecordedJournal read(Path run) throws ReplayRefused {
        if (!Files.isDirectory(run)) {
            throw new ReplayRefused(run + ": not a run folder (no such directory)");
        }
        Path file = run.resolve(FILE_NAME);
        if (!Files.isRegularFile(file)) {
            throw new ReplayRefused(run + ": not a run folder with a controller journal (no " + FILE_NAME + ")");
        }
        ObjectNode header = header(file);
        JournalSummary summary;
        List<JournalEntry> entries = new ArrayList<>();
        try {
            summary = JournalReader.stream(file, entries::add);
        } catch (IllegalArgumentException | UncheckedIOException e) {
            throw new ReplayRefused(file + ": " + e.getMessage());
        }
        if (!summary.damagedLines().isEmpty()) {
            JournalDamage d = summary.damagedLines().get(0);
            throw new ReplayRefused(file + ":" + d.lineNumber() + ": damaged line (" + d.reason()
                    + "); a replay needs every input");
        }
        summary.end().ifPresent(entries::add);
        checkEntries(file, entries);
        return new RecordedJournal(file, header, List.copyOf(entries), required(file, header, "site"),
                required(file, header, "controllerId"), header.path("startedAt").asLong());
    }

    private static ObjectNode header(Path file) throws ReplayRefused {
        String first;
        try (BufferedReader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            first = r.readLine();
        } catch (IOException e) {
            throw new ReplayRefused(file + ": cannot be read: " + e.getMessage());
        }
        JsonNode h;
        try {
            h = first == null ? null : new ObjectMapper().readTree(first);
        } catch (IOException e) {
            h = null;
        }
        if (h == null || !h.isObject() || !JournalFormat.MAGIC.equals(h.path("journal").asText(null))) {
            throw new ReplayRefused(file + ":1: not a Loopstand journal header");
        }
        int version = h.path("schemaVersion").asInt(-1);
        if (version < JournalFormat.FIRST_REPLAYABLE_VERSION) {
            throw new ReplayRefused(file + ":1: journal schemaVersion " + h.get("schemaVersion")
                    + " holds no inputs (they are journaled from version " + JournalFormat.FIRST_REPLAYABLE_VERSION
                    + "); this run cannot be replayed");
        }
        if (version > JournalFormat.SCHEMA_VERSION) {
            throw new ReplayRefused(file + ":1: journal schemaVersion " + version + " is newer than this build reads ("
                    + JournalFormat.FIRST_REPLAYABLE_VERSION + ".." + JournalFormat.SCHEMA_VERSION + ")");
        }
        if (!"controller".equals(h.path("process").asText())) {
            throw new ReplayRefused(file + ":1: the journal of process '" + h.path("process").asText()
                    + "', not a controller's");
        }
        return (ObjectNode) h;
    }

    private static String required(Path file, ObjectNode header, String name) throws ReplayRefused {
        String v = header.path(name).asText("");
        if (v.isBlank()) {
            throw new ReplayRefused(file + ":1: header has no '" + name + "'");
        }
        return v;
    }

    /** Inputs complete, and a cycle schedule start before the first cycle. */
    private static void checkEntries(Path file, List<JournalEntry> entries) throws ReplayRefused {
        boolean anyInput = false;
        boolean cycleClock = false;
        for (JournalEntry e : entries) {
            switch (e.kind()) {
                case InputEntries.KIND -> {
                    anyInput = true;
                    if (e.text("topic") == null || e.get("atMs") == null || !e.get("atMs").canConvertToLong()
                            || (e.text("payload") == null && e.text("payloadBase64") == null)) {
                        throw new ReplayRefused(file + ":" + e.lineNumber()
                                + ": input entry lacks 'topic', 'atMs' or its payload");
                    }
                }
                case InputEntries.KIND_CYCLE_CLOCK -> {
                    cycleClock = true;
                    if (e.get("t0Ns") == null || e.get("periodNs") == null) {
                        throw new ReplayRefused(file + ":" + e.lineNumber() + ": cycleClock entry lacks 't0Ns' or 'periodNs'");
                    }
                }
                case JournalFormat.KIND_DECIDED -> {
                    if (!cycleClock) {
                        throw new ReplayRefused(file + ":" + e.lineNumber() + ": a cycle before any cycleClock entry");
                    }
                    if (e.get("pollNs") == null || !e.get("pollNs").canConvertToLong()) {
                        throw new ReplayRefused(file + ":" + e.lineNumber() + ": decided entry lacks 'pollNs'");
                    }
                }
                default -> {
                    // an output of the controller: compared, not fed
                }
            }
        }
        if (!anyInput) {
            throw new ReplayRefused(file + ": no input entry: the journal lacks the inputs the controller acted on");
        }
    }
}
