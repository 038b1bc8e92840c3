package org.loopstand.plant.unit;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.protocol.message.RefusalReason;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Journal of what the plant interfaces refused or decided on their own (mode changes, watchdog). Keeps
 * the most recent {@value #KEPT} entries in memory and writes every entry to the log
 * ({@code org.loopstand.plant.journal}). Thread-safe.
 */
public final class PlantJournal {
    public static final int KEPT = 10_000;
    private static final Logger LOG = LoggerFactory.getLogger("org.loopstand.plant.journal");

    /**
     * @param epochMs    scenario time, epoch ms
     * @param unit       unit id
     * @param kind       "refused", "mode", "watchdog", "overflow"
     * @param reason     refusal reason, or null for other kinds
     * @param commandSeq seq of the command concerned, −1 when none
     * @param detail     sentence for people
     * @param code       reason code of a decision that is not a command refusal (a refused or
     *                   fenced controller status: {@code wrongTopic}, {@code standby}, ...), else null
     */
    public record Entry(long epochMs, String unit, String kind, RefusalReason reason, long commandSeq, String detail,
                        String code) {
        public Entry(long epochMs, String unit, String kind, RefusalReason reason, long commandSeq, String detail) {
            this(epochMs, unit, kind, reason, commandSeq, detail, null);
        }
    }

    /** Where entries go besides memory and the log (the run journal); called under this journal's lock. */
    public interface Sink {
        void entry(Entry e);

        void command(long epochMs, CommandFate fate);
    }

    private final List<Entry> entries = new ArrayList<>();
    private Sink sink;
    private Sink tap;

    /** Writes every later entry and command fate through to {@code sink} as well (null: none). */
    public synchronized void attach(Sink s) {
        this.sink = s;
    }

    /** Tells a second sink (the metrics counters) everything the first is told (null: none). */
    public synchronized void tap(Sink t) {
        this.tap = t;
    }

    /** Records what was done with a command (accepted or refused); only the sinks keep these. */
    public synchronized void command(long epochMs, CommandFate fate) {
        if (sink != null) {
            sink.command(epochMs, fate);
        }
        if (tap != null) {
            tap.command(epochMs, fate);
        }
    }

    public void refused(long epochMs, String unit, RefusalReason reason, long commandSeq, String detail) {
        add(new Entry(epochMs, unit, "refused", reason, commandSeq, detail));
    }

    public void event(long epochMs, String unit, String kind, String detail) {
        add(new Entry(epochMs, unit, kind, null, -1, detail));
    }

    /** A decision with a reason code that is not a command refusal (kind e.g. "statusRefused"). */
    public void decision(long epochMs, String unit, String kind, String code, String detail) {
        add(new Entry(epochMs, unit, kind, null, -1, detail, code));
    }

    private synchronized void add(Entry e) {
        if (entries.size() == KEPT) {
            entries.remove(0);
        }
        entries.add(e);
        if (sink != null) {
            sink.entry(e);
        }
        if (tap != null) {
            tap.entry(e);
        }
        LOG.info("{} {} {}{} seq={} {}", e.epochMs(), e.unit(), e.kind(),
                e.reason() != null ? " " + e.reason().wireName() : e.code() != null ? " " + e.code() : "",
                e.commandSeq(), e.detail());
    }

    /** @return a copy of the kept entries, oldest first */
    public synchronized List<Entry> entries() {
        return List.copyOf(entries);
    }
}
