package org.loopstand.protocol.journal;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;
import java.util.regex.Pattern;
import org.HdrHistogram.EncodableHistogram;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.HistogramLogReader;
import org.HdrHistogram.HistogramLogWriter;
import org.HdrHistogram.Recorder;
import org.loopstand.protocol.time.Clock;

/**
 * One process's latency and jitter histograms as an HdrHistogram interval log ({@code *.hlog}), one
 * tagged interval histogram per measured quantity per interval.
 *
 * <p>Each quantity has a name (the log's tag) that carries its unit, e.g. {@code commandLatencyUs},
 * {@code cycleStartJitterUs}, {@code ageAtUseMs}. Interval start and end times come from the injected
 * clock (scenario epoch ms), never from the system clock: each interval histogram is taken from its
 * {@link Recorder} reusing the previous one ({@code getIntervalHistogram(reuse)}) and then stamped.
 *
 * <p>Threads: {@link #record} may be called from any thread (the recorders are wait-free writers);
 * {@link #writeIntervalIfDue}, {@link #writeInterval} and {@link #close} from one owner thread. Each
 * interval line is handed to the operating system when written, so a killed process loses at most the
 * interval in progress.
 */
public final class HistogramLogs implements AutoCloseable {
    private static final Pattern TAG = Pattern.compile("[A-Za-z][A-Za-z0-9_.]{0,63}");

    private final Path file;
    private final Clock clock;
    private final long highestTrackableValue;
    private final int significantDigits;
    private final long intervalMs;
    private final OutputStream out;
    private final HistogramLogWriter writer;
    private final Map<String, Quantity> quantities = new ConcurrentHashMap<>();
    private long intervalStartMs;
    private boolean closed;

    private static final class Quantity {
        final Recorder recorder;
        final LongAdder clamped = new LongAdder();
        Histogram reuse;

        Quantity(long highest, int digits) {
            recorder = new Recorder(highest, digits);
        }
    }

    private HistogramLogs(Path file, Clock clock, long highestTrackableValue, int significantDigits, long intervalMs,
            OutputStream out) {
        this.file = file;
        this.clock = clock;
        this.highestTrackableValue = highestTrackableValue;
        this.significantDigits = significantDigits;
        this.intervalMs = intervalMs;
        this.out = out;
        this.writer = new HistogramLogWriter(out);
        this.intervalStartMs = clock.epochMillis();
    }

    /**
     * Creates the log file and writes its preamble (format version, start time, legend).
     *
     * @param file                  the log file, e.g. {@code runs/…/controller.hlog}; must not exist
     * @param clock                 the scenario clock that stamps intervals
     * @param highestTrackableValue largest value kept exactly, in the quantity's unit, ≥ 2; larger
     *                              values are recorded as this value and counted as clamped
     * @param significantDigits     value precision, 1–5
     * @param intervalMs            scenario time between interval histograms, ms, ≥ 1
     * @return the open log
     */
    public static HistogramLogs create(Path file, Clock clock, long highestTrackableValue, int significantDigits,
            long intervalMs) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(clock, "clock");
        if (highestTrackableValue < 2) {
            throw new IllegalArgumentException("highestTrackableValue must be ≥ 2, got " + highestTrackableValue);
        }
        if (significantDigits < 1 || significantDigits > 5) {
            throw new IllegalArgumentException("significantDigits must be in [1, 5], got " + significantDigits);
        }
        if (intervalMs < 1) {
            throw new IllegalArgumentException("intervalMs must be ≥ 1, got " + intervalMs);
        }
        OutputStream out;
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) {
                Files.createDirectories(parent);
            }
            out = Files.newOutputStream(file, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create histogram log " + file + ": " + e.getMessage(), e);
        }
        HistogramLogs logs = new HistogramLogs(file, clock, highestTrackableValue, significantDigits, intervalMs, out);
        logs.writer.outputLogFormatVersion();
        logs.writer.outputComment("Loopstand histogram log; tags carry units; times are scenario time");
        logs.writer.setBaseTime(logs.intervalStartMs);
        logs.writer.outputStartTime(logs.intervalStartMs);
        logs.writer.outputBaseTime(logs.intervalStartMs);
        logs.writer.outputLegend();
        return logs;
    }

    /**
     * Records one value of a quantity. Values below 0 are recorded as 0 and values above the highest
     * trackable value as that value; both are counted in {@link #clampedCount}.
     *
     * @param tag   the quantity's name with its unit, e.g. {@code commandLatencyUs}
     * @param value the value in that unit
     */
    public void record(String tag, long value) {
        Quantity q = quantities.computeIfAbsent(tag, this::newQuantity);
        long v = value;
        if (v < 0 || v > highestTrackableValue) {
            q.clamped.increment();
            v = v < 0 ? 0 : highestTrackableValue;
        }
        q.recorder.recordValue(v);
    }

    /** @return values of {@code tag} recorded outside [0, highest trackable value] so far */
    public long clampedCount(String tag) {
        Quantity q = quantities.get(tag);
        return q == null ? 0 : q.clamped.sum();
    }

    /**
     * Writes one interval histogram per quantity when the interval has passed on the clock.
     *
     * @return true if it wrote
     */
    public boolean writeIntervalIfDue() {
        if (clock.epochMillis() - intervalStartMs >= intervalMs) {
            writeInterval();
            return true;
        }
        return false;
    }

    /** Writes one interval histogram per quantity now, covering the time since the last interval. */
    public void writeInterval() {
        if (closed) {
            throw new IllegalStateException("histogram log " + file + " is closed");
        }
        long endMs = Math.max(clock.epochMillis(), intervalStartMs);
        for (Map.Entry<String, Quantity> e : new TreeMap<>(quantities).entrySet()) {
            Quantity q = e.getValue();
            Histogram h = q.recorder.getIntervalHistogram(q.reuse);
            q.reuse = h;
            // The recorder stamps with the system clock; the rig's time is the injected clock.
            h.setStartTimeStamp(intervalStartMs);
            h.setEndTimeStamp(endMs);
            h.setTag(e.getKey());
            writer.outputIntervalHistogram(h);
        }
        intervalStartMs = endMs;
    }

    /** Writes the last interval, notes clamped counts as comments and closes the file. */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        writeInterval();
        for (Map.Entry<String, Quantity> e : new TreeMap<>(quantities).entrySet()) {
            long n = e.getValue().clamped.sum();
            if (n > 0) {
                writer.outputComment("clamped " + e.getKey() + " " + n);
            }
        }
        closed = true;
        writer.close();
        try {
            out.close();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot close histogram log " + file + ": " + e.getMessage(), e);
        }
    }

    private Quantity newQuantity(String tag) {
        if (tag == null || !TAG.matcher(tag).matches()) {
            throw new IllegalArgumentException("histogram tag must match " + TAG.pattern() + ", got '" + tag + "'");
        }
        return new Quantity(highestTrackableValue, significantDigits);
    }

    /**
     * Totals of an interval log, per tag.
     *
     * @param histograms  per tag, the sum of all its interval histograms
     * @param tornTail    true when reading stopped at a line that could not be decoded (a killed writer)
     */
    public record Totals(Map<String, Histogram> histograms, boolean tornTail) {
    }

    /**
     * Reads an interval log and adds up each tag's intervals; a torn last line is reported, not fatal.
     *
     * @param file an interval log written by this class
     * @return totals per tag
     */
    public static Totals readTotals(Path file) {
        Map<String, Histogram> totals = new TreeMap<>();
        boolean torn = false;
        try (InputStream in = Files.newInputStream(file); HistogramLogReader reader = new HistogramLogReader(in)) {
            while (true) {
                EncodableHistogram eh;
                try {
                    eh = reader.nextIntervalHistogram();
                } catch (RuntimeException e) {
                    torn = true;
                    break;
                }
                if (eh == null) {
                    break;
                }
                if (eh instanceof Histogram h) {
                    String tag = h.getTag() == null ? "untagged" : h.getTag();
                    totals.computeIfAbsent(tag, k -> {
                        Histogram sum = new Histogram(h.getNumberOfSignificantValueDigits());
                        sum.setAutoResize(true);
                        return sum;
                    }).add(h);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read histogram log " + file + ": " + e.getMessage(), e);
        }
        return new Totals(totals, torn);
    }
}
