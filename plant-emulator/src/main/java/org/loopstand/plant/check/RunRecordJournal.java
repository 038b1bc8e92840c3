package org.loopstand.plant.check;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;

/**
 * A {@link RunRecord} in the run journal, so checks can be decided again later from the journal alone.
 * Entry kinds: {@code truthSample} ({@code tS}, {@code values}: series key → value),
 * {@code commandRecord} ({@code receivedS}, {@code command} as on the wire, {@code fate},
 * {@code outcome}, {@code reason}, {@code acted}), {@code statusSeen} ({@code receivedS},
 * {@code status} as on the wire), {@code scenarioEvent} ({@code atS}, {@code type}, {@code description}),
 * {@code faultWindow} (written at the end: {@code id}, {@code type}, {@code category}, {@code targets},
 * {@code startS}, {@code endS}, null = still active) and {@code runEnd} ({@code endS}).
 */
public final class RunRecordJournal {
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final MessageCodec CODEC = new MessageCodec();

    private RunRecordJournal() {
    }

    /** Writes a run record's additions into a journal. */
    static final class Mirror {
        private final JournalWriter writer;
        private final long startMs;

        Mirror(JournalWriter writer, long startMs) {
            this.writer = writer;
            this.startMs = startMs;
        }

        private long t(double s) {
            return startMs + Math.round(s * 1000);
        }

        void truthSample(double tS, Map<String, Double> values) {
            writer.append(t(tS), "truthSample", Map.of("tS", tS, "values", values));
        }

        void event(double atS, String type, String description) {
            writer.append(t(atS), "scenarioEvent", Map.of("atS", atS, "type", type, "description", description));
        }

        void command(RunRecord.CommandRecord c) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("receivedS", c.receivedS());
            f.put("command", tree(c.command()));
            f.put("fate", c.fate());
            f.put("outcome", c.outcome() == null ? null : tree(c.outcome()));
            f.put("reason", c.reason() == null ? null : tree(c.reason()));
            f.put("acted", c.acted());
            writer.append(t(c.receivedS()), "commandRecord", f);
        }

        void status(double receivedS, ControllerStatus s) {
            writer.append(t(receivedS), "statusSeen", Map.of("receivedS", receivedS, "status", tree(s)));
        }

        void faultWindow(RunRecord.FaultWindow w) {
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("id", w.id());
            f.put("type", w.type());
            f.put("category", w.category());
            f.put("targets", w.targets());
            f.put("startS", w.startS());
            f.put("endS", Double.isInfinite(w.endS()) ? null : w.endS());
            writer.append(t(w.startS()), "faultWindow", f);
        }

        void end(double endS) {
            writer.append(t(endS), "runEnd", Map.of("endS", endS));
        }

        private static JsonNode tree(Object wireValue) {
            try {
                if (wireValue instanceof Enum<?>) {
                    return MAPPER.readTree(MAPPER.writeValueAsBytes(wireValue));
                }
                return MAPPER.readTree(CODEC.encode(wireValue));
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    /**
     * Rebuilds a run record from a journal written with {@link RunRecord#mirrorTo}.
     *
     * @throws IllegalArgumentException naming the journal line of an entry that cannot be read
     */
    public static RunRecord read(Path journal, long runStartEpochMs) {
        RunRecord run = new RunRecord(runStartEpochMs);
        for (JournalEntry e : JournalReader.readAll(journal).entries()) {
            try {
                apply(run, e, runStartEpochMs);
            } catch (RuntimeException ex) {
                throw new IllegalArgumentException(journal + ":" + e.lineNumber() + ": cannot read " + e.kind() + " entry: "
                        + ex.getMessage(), ex);
            }
        }
        return run;
    }

    private static void apply(RunRecord run, JournalEntry e, long startMs) {
        switch (e.kind()) {
            case "truthSample" -> {
                double tS = e.get("tS").asDouble();
                e.get("values").fields().forEachRemaining(v -> run.series(v.getKey()).add(tS, v.getValue().asDouble()));
                run.end(tS);
            }
            case "scenarioEvent" -> run.event(e.get("atS").asDouble(), e.text("type"), e.text("description"));
            case "commandRecord" -> run.add(new RunRecord.CommandRecord(e.get("receivedS").asDouble(),
                    decode(e.get("command"), UnitCommand.class), e.text("fate"),
                    e.get("outcome").isNull() ? null : MAPPER.convertValue(e.get("outcome"), AckOutcome.class),
                    e.get("reason").isNull() ? null : MAPPER.convertValue(e.get("reason"), RefusalReason.class),
                    e.get("acted").asBoolean()));
            case "statusSeen" -> run.controllerStatus(startMs + Math.round(e.get("receivedS").asDouble() * 1000),
                    decode(e.get("status"), ControllerStatus.class));
            case "faultWindow" -> {
                List<String> targets = new ArrayList<>();
                e.get("targets").forEach(t -> targets.add(t.asText()));
                JsonNode end = e.get("endS");
                run.add(new RunRecord.FaultWindow(e.text("id"), e.text("type"), e.text("category"), targets,
                        e.get("startS").asDouble(), end == null || end.isNull() ? Double.POSITIVE_INFINITY : end.asDouble()));
            }
            case "runEnd" -> run.end(e.get("endS").asDouble());
            default -> {
                // other processes' and the fault journal's entries are not part of the run record
            }
        }
    }

    private static <T> T decode(JsonNode node, Class<T> type) {
        try {
            Decoded<T> d = CODEC.decode(MAPPER.writeValueAsBytes(node), type);
            if (d instanceof Decoded.Ok<T> ok) {
                return ok.value();
            }
            throw new IllegalArgumentException(type.getSimpleName() + " does not decode: " + d);
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
    }
}
