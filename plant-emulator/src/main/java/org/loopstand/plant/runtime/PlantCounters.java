package org.loopstand.plant.runtime;

import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;

import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.Publication;
import org.loopstand.plant.unit.CommandFate;
import org.loopstand.plant.unit.PlantJournal;

/**
 * The plant's counters for the metrics page, fed at the same points that feed the run journal (so a
 * journal and the page agree): every message the plant sent or could not send, what the fault stage
 * did with it, and every command's fate. Written on the plant thread, read on any thread.
 */
public final class PlantCounters implements PlantJournal.Sink, FaultObserver {
    /** Counts by a key of label values joined with {@link #SEP}. */
    private final Map<String, LongAdder> sent = new ConcurrentHashMap<>();
    private final Map<String, LongAdder> notSent = new ConcurrentHashMap<>();
    private final Map<String, LongAdder> faultLost = new ConcurrentHashMap<>();
    private final Map<String, LongAdder> commands = new ConcurrentHashMap<>();
    private final Map<String, LongAdder> refusals = new ConcurrentHashMap<>();
    private final Map<String, String> lastCommand = new ConcurrentHashMap<>();
    public static final String SEP = "\u0000";

    /**
     * One message the plant handed to its link (or its fault stage), or could not.
     *
     * @param kind record name: AreaMeter, UnitTelemetry, CommandAck
     * @param why  why it was not sent (notConnected, linkCut, …); ignored when sent
     */
    public void published(String kind, boolean wasSent, String why) {
        count(wasSent ? sent : notSent, wasSent ? kind : kind + SEP + why);
    }

    @Override
    public void published(long tMs, Publication p) {
        if (!Publication.SENT.equals(p.fate())) {
            count(faultLost, (p.stream().startsWith("meter/") ? "AreaMeter" : "UnitTelemetry") + SEP + p.fate());
        }
    }

    @Override
    public void entry(PlantJournal.Entry e) {
        // refusals are counted from the command fates, which carry the same reasons
    }

    @Override
    public void command(long epochMs, CommandFate fate) {
        count(commands, (fate.kind() == null ? "malformed" : fate.kind()) + SEP + fate.outcome());
        if (fate.reason() != null) {
            count(refusals, fate.reason());
        }
        String what = fate.kind() == null ? "malformed" : "pulse".equals(fate.kind())
                ? fate.direction() + " " + fate.durationMs() + " ms" : "setpoint " + fate.setpointMw() + " MW";
        lastCommand.put(fate.unit(), what + " #" + fate.commandSeq() + " " + fate.outcome()
                + (fate.reason() == null ? "" : " (" + fate.reason() + ")"));
    }

    /** @return the unit's last command and its fate, for people ("" before the first) */
    public String lastCommand(String unit) {
        return lastCommand.getOrDefault(unit, "");
    }

    private static void count(Map<String, LongAdder> m, String key) {
        m.computeIfAbsent(key, k -> new LongAdder()).increment();
    }

    /** @return sent messages by kind */
    public Map<String, Long> sentByKind() {
        return copy(sent);
    }

    /** @return messages not sent by the plant, by kind + SEP + reason */
    public Map<String, Long> notSentByKindAndReason() {
        return copy(notSent);
    }

    /** @return messages the fault stage did not put on the wire, by kind + SEP + fate */
    public Map<String, Long> faultLostByKindAndFate() {
        return copy(faultLost);
    }

    /** @return commands by kind + SEP + outcome */
    public Map<String, Long> commandsByKindAndOutcome() {
        return copy(commands);
    }

    /** @return refused commands by reason (wire name) */
    public Map<String, Long> refusalsByReason() {
        return copy(refusals);
    }

    private static Map<String, Long> copy(Map<String, LongAdder> m) {
        Map<String, Long> out = new TreeMap<>();
        m.forEach((k, v) -> out.put(k, v.sum()));
        return out;
    }
}
