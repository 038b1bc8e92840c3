package org.loopstand.plant.fault;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalSink;
import org.loopstand.protocol.message.UnitCommand;

/**
 * Writes faults into the run journal: kind {@code fault} for every start, stop and refusal, and for
 * every publication a fault touched a {@code truth} entry (the record built from the physics) beside
 * a {@code published} entry (what went on the wire, or nothing, with the fate); kind {@code commandFault}
 * for commands the command stage touched. Untouched publications are left to the plant's own
 * {@code sent} entries. Not thread-safe, like the writer.
 */
public final class FaultJournal implements FaultObserver {
    /** Entry kind of a command the command stage acted on. */
    public static final String KIND_COMMAND_FAULT = "commandFault";
    /** Entry kind of a network fault's effect on the links between hosts (or why it had none). */
    public static final String KIND_NETWORK_FAULT = "networkFault";
    /** Entry kind of what went on the wire in place of the truth. */
    public static final String KIND_PUBLISHED = "published";

    private final JournalSink writer;

    public FaultJournal(JournalSink writer) {
        this.writer = writer;
    }

    @Override
    public void faultStarted(long tMs, FaultSpec spec, String source) {
        Map<String, Object> f = describe(spec, "start", source);
        writer.append(tMs, JournalFormat.KIND_FAULT, f);
    }

    @Override
    public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
        Map<String, Object> f = describe(spec, "stop", source);
        f.put("reason", reason);
        writer.append(tMs, JournalFormat.KIND_FAULT, f);
    }

    @Override
    public void faultRefused(long tMs, String orderId, String reason) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("action", "refused");
        f.put("faultId", orderId);
        f.put("reason", reason);
        writer.append(tMs, JournalFormat.KIND_FAULT, f);
    }

    @Override
    public void published(long tMs, Publication p) {
        if (!p.affected()) {
            return;
        }
        Map<String, Object> truth = new LinkedHashMap<>();
        truth.put("stream", p.stream());
        truth.put("record", p.truth());
        writer.append(tMs, JournalFormat.KIND_TRUTH, truth);
        Map<String, Object> pub = new LinkedHashMap<>();
        pub.put("stream", p.stream());
        pub.put("topic", p.topic());
        pub.put("fate", p.fate());
        pub.put("faults", p.faultIds());
        pub.put("detail", p.detail());
        pub.put("record", p.published());
        writer.append(tMs, KIND_PUBLISHED, pub);
    }

    @Override
    public void commandPassed(long tMs, UnitCommand command, String fate, List<String> faultIds) {
        if (faultIds.isEmpty()) {
            return;
        }
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("unit", command.unit());
        f.put("commandSeq", command.seq());
        f.put("fate", fate);
        f.put("faults", faultIds);
        writer.append(tMs, KIND_COMMAND_FAULT, f);
    }

    @Override
    public void networkFault(long tMs, FaultSpec spec, String action, List<String> links, String detail) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("faultId", spec.id());
        f.put("type", spec.type().name());
        f.put("action", action);
        f.put("hosts", spec.targets().stream().map(FaultTarget::id).toList());
        f.put("links", links);
        f.put("windowS", spec.endS() - spec.startS());
        f.put("detail", detail);
        writer.append(tMs, KIND_NETWORK_FAULT, f);
    }

    private static Map<String, Object> describe(FaultSpec spec, String action, String source) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("action", action);
        f.put("faultId", spec.id());
        f.put("type", spec.type().name());
        f.put("category", spec.type().category().name().toLowerCase(java.util.Locale.ROOT));
        f.put("targets", spec.targets().stream().map(FaultTarget::id).toList());
        Map<String, Object> params = new LinkedHashMap<>();
        spec.parameters().forEach((k, v) -> params.put(k, v instanceof Double d && d.isNaN() ? null : v));
        f.put("parameters", params);
        f.put("source", source);
        f.put("startS", spec.startS());
        f.put("endS", Double.isInfinite(spec.endS()) ? null : spec.endS());
        return f;
    }
}
