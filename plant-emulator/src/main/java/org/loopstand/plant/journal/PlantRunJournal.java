package org.loopstand.plant.journal;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.unit.CommandFate;
import org.loopstand.plant.unit.PlantJournal;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalSink;
import org.loopstand.protocol.journal.QueuedJournal;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.time.Clock;

/**
 * The plant process's run journal: {@code plant.jsonl} (fields agreed in the run journal contract:
 * {@code truth}, {@code published}, {@code command}, {@code event}, {@code fault}) and {@code plant.hlog}
 * (step lateness, command receipt → reference / output change, µs of scenario time).
 *
 * <p>Entry times are scenario epoch ms. Flushes are scheduled on a wall clock (at least every second
 * when {@link #flushIfDue()} is called from the loop) so a killed process loses at most about a
 * second. Every method is synchronized: the plant loop is the usual caller, but a shutdown hook may
 * close it.
 */
public final class PlantRunJournal implements PlantJournal.Sink, org.loopstand.plant.fault.FaultObserver, AutoCloseable {
    /** Histogram tags, with their units. */
    public static final String STEP_LATENESS_US = "stepLatenessUs";
    public static final String COMMAND_TO_REFERENCE_US = "commandToReferenceUs";
    public static final String COMMAND_TO_OUTPUT_US = "commandToOutputUs";

    private final JournalWriter writer;
    /** the writer, or the queue in front of it */
    private final JournalSink journal;
    private final QueuedJournal queue;
    private final HistogramLogs histograms;
    private final org.loopstand.plant.fault.FaultJournal faults;

    private PlantRunJournal(JournalWriter writer, QueuedJournal queue, HistogramLogs histograms) {
        this.writer = writer;
        this.queue = queue;
        this.journal = queue != null ? queue : writer;
        this.histograms = histograms;
        this.faults = new org.loopstand.plant.fault.FaultJournal(journal);
    }

    // ---- faults: written by the fault library's own journal format (kind fault, commandFault, published)

    @Override
    public synchronized void faultStarted(long tMs, org.loopstand.plant.fault.FaultSpec spec, String source) {
        if (!journal.isClosed()) {
            faults.faultStarted(tMs, spec, source);
        }
    }

    @Override
    public synchronized void faultStopped(long tMs, org.loopstand.plant.fault.FaultSpec spec, String source, String reason) {
        if (!journal.isClosed()) {
            faults.faultStopped(tMs, spec, source, reason);
        }
    }

    @Override
    public synchronized void networkFault(long tMs, org.loopstand.plant.fault.FaultSpec spec, String action,
            List<String> links, String detail) {
        if (!journal.isClosed()) {
            faults.networkFault(tMs, spec, action, links, detail);
        }
    }

    @Override
    public synchronized void faultRefused(long tMs, String orderId, String reason) {
        if (!journal.isClosed()) {
            faults.faultRefused(tMs, orderId, reason);
        }
    }

    @Override
    public synchronized void published(long tMs, org.loopstand.plant.fault.Publication p) {
        if (!journal.isClosed()) {
            faults.published(tMs, p);
        }
    }

    @Override
    public synchronized void commandPassed(long tMs, org.loopstand.protocol.message.UnitCommand command, String fate,
                                           List<String> faultIds) {
        if (!journal.isClosed()) {
            faults.commandPassed(tMs, command, fate, faultIds);
        }
    }

    /** A scenario check as decided at the end of the run: the report's pass/fail table reads these. */
    public synchronized void check(long tMs, org.loopstand.plant.check.CheckOutcome o) {
        if (!journal.isClosed()) {
            journal.append(tMs, "check", PlantEntryFields.check(o));
        }
    }

    /**
     * Creates {@code plant.jsonl} and {@code plant.hlog} in {@code dir}.
     *
     * @param dir           the run folder (created if missing); the files must not exist yet
     * @param startedAtMs   scenario time at start, epoch ms
     * @param header        header extras: site, scenario, rate, seed, broker, grouping, versions
     * @param scenarioClock stamps histogram intervals (every 10 s of scenario time)
     * @param wallClock     schedules flushes
     */
    public static PlantRunJournal create(Path dir, long startedAtMs, Map<String, ?> header, Clock scenarioClock,
                                         Clock wallClock) {
        return create(dir, startedAtMs, header, scenarioClock, wallClock, 0);
    }

    /**
     * As {@link #create(Path, long, Map, Clock, Clock)}, with {@code queueCapacity} &gt; 0 the entries are
     * turned into JSON and written on a writer thread behind a bounded queue ({@link QueuedJournal}:
     * entries beyond the capacity are dropped, counted by kind and journaled at close); 0 writes on
     * the caller's thread.
     *
     * @param queueCapacity entries that may wait for the writer thread, 0 – 10,000,000 (0 = no queue)
     */
    public static PlantRunJournal create(Path dir, long startedAtMs, Map<String, ?> header, Clock scenarioClock,
                                         Clock wallClock, int queueCapacity) {
        return create(dir, "plant", startedAtMs, header, scenarioClock, wallClock, queueCapacity);
    }

    /**
     * As {@link #create(Path, long, Map, Clock, Clock, int)} under another name: {@code NAME.jsonl} and
     * {@code NAME.hlog}, process {@code NAME} in the header (a unit interface in a process of its own
     * journals as {@code unit-{unit}}, beside the plant's journal in the same run folder).
     *
     * @param name file and process name, letters, digits, '-' and '_' only
     */
    public static PlantRunJournal create(Path dir, String name, long startedAtMs, Map<String, ?> header,
                                         Clock scenarioClock, Clock wallClock, int queueCapacity) {
        if (queueCapacity < 0 || queueCapacity > 10_000_000) {
            throw new IllegalArgumentException("journal queue capacity must be in [0, 10000000], got " + queueCapacity);
        }
        if (name == null || !name.matches("[A-Za-z0-9_-]+")) {
            throw new IllegalArgumentException("journal name must be letters, digits, '-' and '_', got '" + name + "'");
        }
        JournalWriter w = JournalWriter.create(dir.resolve(name + ".jsonl"), name, startedAtMs, header, wallClock,
                JournalWriter.DEFAULT_FLUSH_INTERVAL);
        HistogramLogs h = HistogramLogs.create(dir.resolve(name + ".hlog"), scenarioClock, 3_600_000_000L, 3, 10_000);
        return new PlantRunJournal(w, queueCapacity == 0 ? null : new QueuedJournal(w, queueCapacity, "plant-journal"), h);
    }

    /** @return entries dropped because the journal queue was full (0 without a queue) */
    public synchronized long droppedEntries() {
        return queue == null ? 0 : queue.dropped();
    }

    /** Writes the physics as it is: every area, tie and unit. */
    public synchronized void truth(long tMs, GridSimulator sim, Map<String, String> controlModes) {
        if (!journal.isClosed()) {
            journal.append(tMs, JournalFormat.KIND_TRUTH, PlantEntryFields.truth(sim, controlModes));
        }
    }

    /**
     * One meter or telemetry message the plant sent or tried to send.
     *
     * @param type    record name ({@code AreaMeter}, {@code UnitTelemetry}, {@code CommandAck})
     * @param why     why it was not sent (e.g. {@code notConnected}), null when sent
     * @param payload the encoded message
     */
    public synchronized void published(long tMs, String topic, String type, long seq, boolean sent, String why,
                                       byte[] payload, List<String> faults) {
        if (journal.isClosed()) {
            return;
        }
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("topic", topic);
        f.put("type", type);
        f.put("seq", seq);
        f.put("sent", sent);
        if (why != null) {
            f.put("why", why);
        }
        f.put("message", new EncodedJson(payload)); // parsed back where the entry is written
        if (faults != null && !faults.isEmpty()) {
            f.put("faults", faults);
        }
        journal.append(tMs, "published", f);
    }

    @Override
    public synchronized void command(long epochMs, CommandFate fate) {
        if (!journal.isClosed()) {
            journal.append(epochMs, "command", PlantEntryFields.command(fate));
        }
    }

    /**
     * A controller status as the plant received it (the heartbeat the units watch, and the controller's
     * own ACE): the report draws heartbeat gaps, state changes and the controller's ACE from these.
     *
     * @param arrivedMs scenario epoch ms when the plant received it
     */
    public synchronized void controllerStatus(long arrivedMs, org.loopstand.protocol.message.ControllerStatus s) {
        if (!journal.isClosed()) {
            journal.append(arrivedMs, "controllerStatus", PlantEntryFields.controllerStatus(s));
        }
    }

    /** Plant interface decisions of their own (mode changes, watchdog, intake overflow) as events. */
    @Override
    public synchronized void entry(PlantJournal.Entry e) {
        if (journal.isClosed() || "refused".equals(e.kind())) {
            return; // refusals are journaled as command entries with their fate
        }
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", e.kind());
        f.put("unit", e.unit());
        if (e.code() != null) {
            f.put("reason", e.code());
        }
        f.put("detail", e.detail());
        journal.append(e.epochMs(), JournalFormat.KIND_EVENT, f);
    }

    /** A scenario or process event: {@code fields} must hold {@code event}. */
    public synchronized void event(long tMs, Map<String, ?> fields) {
        if (!journal.isClosed()) {
            journal.append(tMs, JournalFormat.KIND_EVENT, fields);
        }
    }

    /** An operator order as received (returnToRemote, setControlMode, unitLinkDown), as an event. */
    public synchronized void operatorOrder(long tMs, FaultOrder o) {
        if (journal.isClosed()) {
            return;
        }
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", "operatorOrder");
        f.put("action", o.action().name().toLowerCase(java.util.Locale.ROOT));
        f.put("orderId", o.orderId());
        f.put("faultType", o.faultType());
        f.put("targets", o.targets());
        f.put("parameters", o.parameters());
        if (o.durationS() != null) {
            f.put("durationS", o.durationS());
        }
        journal.append(tMs, JournalFormat.KIND_EVENT, f);
    }

    /** Records one value of a histogram quantity (tags above). */
    public synchronized void record(String tag, long value) {
        if (!journal.isClosed()) {
            histograms.record(tag, value);
        }
    }

    /** Call from the loop: flushes the journal at least every second and writes due histogram intervals. */
    public synchronized void flushIfDue() {
        if (!journal.isClosed()) {
            if (queue == null) {
                writer.flushIfDue(); // the queue's writer thread flushes by itself
            }
            histograms.writeIntervalIfDue();
        }
    }

    /** Writes the end entry and closes both files; later calls do nothing. */
    public synchronized void close(long tMs, EndReason reason) {
        if (journal.isClosed()) {
            return;
        }
        try {
            histograms.close();
        } finally {
            if (queue != null) {
                queue.close(tMs, reason);
            } else {
                writer.close(tMs, reason);
            }
        }
    }

    /** Closes with reason stopped at the time of the last entry; later calls do nothing. */
    @Override
    public synchronized void close() {
        if (journal.isClosed()) {
            return;
        }
        try {
            histograms.close();
        } finally {
            if (queue != null) {
                queue.close();
            } else {
                writer.close();
            }
        }
    }

    public synchronized boolean isClosed() {
        return journal.isClosed();
    }

    public Path file() {
        return writer.file();
    }
}
