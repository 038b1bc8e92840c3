package org.loopstand.protocol.journal;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;
import java.util.regex.Pattern;
import org.loopstand.protocol.time.Clock;

/**
 * Appends one process's run journal as JSON Lines: a header line, then one entry per line
 * ({@code {"t":<scenario epoch ms>,"kind":"…", …fields}}), then on a clean close an {@code end} entry.
 *
 * <p><b>Durability.</b> Lines are buffered in memory and handed to the operating system by
 * {@link #flushIfDue()} once at least the flush interval of <em>flush-clock</em> time has passed since
 * the last flush (give it a wall clock: durability is about real seconds, not scenario seconds), and
 * on {@link #close()}. Data handed to the operating system survives a SIGKILL of the process; close
 * also forces it to the disk. A process killed between flushes loses at most the lines written since
 * the last flush, and may leave a torn last line, which {@link JournalReader} reports.
 *
 * <p><b>Timestamps.</b> Entry times are given by the caller (from the injected scenario clock); the
 * writer never reads a clock for them.
 *
 * <p><b>Threads.</b> Not thread-safe: one thread at a time (normally the agent that owns it) calls
 * every method. Handing it to another thread needs a happens-before edge such as starting that thread.
 */
public final class JournalWriter implements JournalSink, AutoCloseable {
    /** Default flush interval: at most one second of journal lost on a kill. */
    public static final Duration DEFAULT_FLUSH_INTERVAL = Duration.ofSeconds(1);

    private static final Pattern KIND = Pattern.compile(JournalFormat.KIND_PATTERN);
    private static final int BUFFER_BYTES = 64 * 1024;

    private final Path file;
    private final FileChannel channel;
    private final OutputStream out;
    private final ObjectMapper mapper;
    private final Clock flushClock;
    private final long flushIntervalNanos;
    private long lastFlushNanos;
    private long entriesWritten;
    private long entriesFlushed;
    private long lastEntryTimeMs;
    private boolean closed;

    private JournalWriter(Path file, FileChannel channel, Clock flushClock, Duration flushInterval) {
        this.file = file;
        this.channel = channel;
        this.out = new BufferedOutputStream(Channels.newOutputStream(channel), BUFFER_BYTES);
        this.mapper = JournalFormat.newMapper().findAndRegisterModules();
        this.flushClock = flushClock;
        this.flushIntervalNanos = flushInterval.toNanos();
        this.lastFlushNanos = flushClock.monotonicNanos();
    }

    /**
     * Creates a new journal file and writes its header line (flushed at once, so even a process killed
     * straight after start leaves a readable journal).
     *
     * @param file            the journal file, e.g. {@code runs/…/plant.jsonl}; must not exist yet
     * @param process         name of the writing process, e.g. {@code plant}, {@code controller}
     * @param startedAtMs     scenario time at start, epoch ms
     * @param headerExtras    extra header fields (configuration, versions, site…); may be empty
     * @param flushClock      the clock that schedules flushes; a wall clock in production
     * @param flushInterval   longest time between flushes, 1 ms – 60 s
     * @return the open writer
     * @throws UncheckedIOException if the file exists or cannot be created
     */
    public static JournalWriter create(Path file, String process, long startedAtMs,
            Map<String, ?> headerExtras, Clock flushClock, Duration flushInterval) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(flushClock, "flushClock");
        Objects.requireNonNull(headerExtras, "headerExtras");
        if (process == null || process.isBlank()) {
            throw new IllegalArgumentException("journal process name must not be blank");
        }
        if (flushInterval == null || flushInterval.toMillis() < 1 || flushInterval.toSeconds() > 60) {
            throw new IllegalArgumentException("flushInterval must be in [1 ms, 60 s], got " + flushInterval);
        }
        for (String reserved : new String[] {"journal", "schemaVersion", "process", "startedAt"}) {
            if (headerExtras.containsKey(reserved)) {
                throw new IllegalArgumentException("header extra '" + reserved + "' is reserved");
            }
        }
        FileChannel channel;
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) {
                Files.createDirectories(parent);
            }
            channel = FileChannel.open(file, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create journal " + file + ": " + e.getMessage(), e);
        }
        JournalWriter writer = new JournalWriter(file, channel, flushClock, flushInterval);
        Map<String, Object> header = new LinkedHashMap<>();
        header.put("journal", JournalFormat.MAGIC);
        header.put("schemaVersion", JournalFormat.SCHEMA_VERSION);
        header.put("process", process);
        header.put("startedAt", startedAtMs);
        header.putAll(headerExtras);
        writer.writeLine(writer.mapper.valueToTree(header));
        writer.lastEntryTimeMs = startedAtMs;
        writer.flush();
        return writer;
    }

    /** Same as {@link #create} with no header extras and the {@link #DEFAULT_FLUSH_INTERVAL}. */
    public static JournalWriter create(Path file, String process, long startedAtMs, Clock flushClock) {
        return create(file, process, startedAtMs, Map.of(), flushClock, DEFAULT_FLUSH_INTERVAL);
    }

    /**
     * Appends one entry, then flushes if the flush interval has passed.
     *
     * @param tMs    scenario time of the entry, epoch ms (from the caller's clock)
     * @param kind   entry kind, see {@link JournalFormat} ({@code received}, {@code sent}, …)
     * @param fields the entry's fields: a {@code Map} or any object Jackson serializes to a JSON
     *               object (a record); must not use the names {@code t} or {@code kind}
     */
    @Override
    public void append(long tMs, String kind, Object fields) {
        ensureOpen();
        if (kind == null || !KIND.matcher(kind).matches()) {
            throw new IllegalArgumentException("journal kind must match " + JournalFormat.KIND_PATTERN + ", got '" + kind + "'");
        }
        if (JournalFormat.KIND_END.equals(kind)) {
            throw new IllegalArgumentException("kind 'end' is written by close(), not append()");
        }
        ObjectNode line = mapper.createObjectNode();
        line.put(JournalFormat.FIELD_TIME, tMs);
        line.put(JournalFormat.FIELD_KIND, kind);
        if (fields != null) {
            JsonNode tree = mapper.valueToTree(fields);
            if (!tree.isObject()) {
                throw new IllegalArgumentException("journal fields must serialize to a JSON object, got "
                        + tree.getNodeType() + " from " + fields.getClass().getName());
            }
            var names = tree.fieldNames();
            while (names.hasNext()) {
                String name = names.next();
                if (JournalFormat.FIELD_TIME.equals(name) || JournalFormat.FIELD_KIND.equals(name)) {
                    throw new IllegalArgumentException("journal field name '" + name + "' is reserved");
                }
                line.set(name, tree.get(name));
            }
        }
        writeLine(line);
        entriesWritten++;
        lastEntryTimeMs = tMs;
        flushIfDue();
    }

    /**
     * Flushes when at least the flush interval of flush-clock time has passed since the last flush.
     * Call it from the owner's duty cycle even when nothing is appended.
     *
     * @return true if it flushed
     */
    public boolean flushIfDue() {
        ensureOpen();
        if (flushClock.monotonicNanos() - lastFlushNanos >= flushIntervalNanos) {
            flush();
            return true;
        }
        return false;
    }

    /** Hands every buffered line to the operating system now. */
    public void flush() {
        ensureOpen();
        try {
            out.flush();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot flush journal " + file + ": " + e.getMessage(), e);
        }
        entriesFlushed = entriesWritten;
        lastFlushNanos = flushClock.monotonicNanos();
    }

    /**
     * Writes the closing {@code end} entry, flushes, forces to disk and closes. Later calls do nothing.
     *
     * @param tMs    scenario time of the end, epoch ms
     * @param reason why the run ended
     */
    public void close(long tMs, EndReason reason) {
        if (closed) {
            return;
        }
        Objects.requireNonNull(reason, "reason");
        ObjectNode line = mapper.createObjectNode();
        line.put(JournalFormat.FIELD_TIME, tMs);
        line.put(JournalFormat.FIELD_KIND, JournalFormat.KIND_END);
        line.put(JournalFormat.FIELD_REASON, reason.wireName());
        line.put("entries", entriesWritten);
        writeLine(line);
        flush();
        closed = true;
        try {
            channel.force(false);
            out.close();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot close journal " + file + ": " + e.getMessage(), e);
        }
    }

    /** Closes with reason {@link EndReason#STOPPED} at the time of the last entry, unless already closed. */
    @Override
    public void close() {
        close(lastEntryTimeMs, EndReason.STOPPED);
    }

    /** @return entries appended so far (header and end excluded) */
    public long entriesWritten() {
        return entriesWritten;
    }

    /** @return entries handed to the operating system by the last flush */
    public long entriesFlushed() {
        return entriesFlushed;
    }

    /** @return the journal file */
    public Path file() {
        return file;
    }

    /** @return true once closed */
    @Override
    public boolean isClosed() {
        return closed;
    }

    private void writeLine(JsonNode node) {
        try {
            out.write(mapper.writeValueAsBytes(node));
            out.write('\n');
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write journal " + file + ": " + e.getMessage(), e);
        }
    }

    private void ensureOpen() {
        if (closed) {
            throw new IllegalStateException("journal " + file + " is closed");
        }
    }
}
