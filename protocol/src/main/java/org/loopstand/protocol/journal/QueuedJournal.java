package org.loopstand.protocol.journal;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.TimeUnit;

/**
 * A bounded queue and a writer thread in front of a {@link JournalWriter}: {@link #append} only
 * queues the entry (its fields are turned into JSON and written on the writer thread), so a
 * real-time loop never waits for Jackson or the disk. When the queue is full the entry is dropped
 * and counted by kind, never silently: {@link #close(long, EndReason)} writes a
 * {@value #QUEUE_EVENT} event (capacity, entries queued, dropped in all and by kind, most entries
 * waiting at once, entries the writer could not write) before the end entry. Flushes keep the
 * writer's rule (at least every flush interval of its flush clock), done by the writer thread.
 *
 * <p><b>Threads.</b> {@link #append} may be called from any thread; entries keep the order in which
 * their appends returned. The fields must not be changed after they were handed over. {@link #close}
 * is called once by the owner.
 */
public final class QueuedJournal implements JournalSink, AutoCloseable {
    /** Event written at close with the queue's figures. */
    public static final String QUEUE_EVENT = "journalQueue";
    /** Longest wait of the writer thread for an entry, ms (it flushes when due in between). */
    static final long POLL_MS = 50;

    private record Entry(long tMs, String kind, Object fields) {
    }

    private final JournalWriter writer;
    private final int capacity;
    private final ArrayBlockingQueue<Entry> queue;
    private final Thread thread;
    private final Map<String, Long> droppedByKind = new TreeMap<>();
    private volatile boolean closing;
    private long queued;
    private long dropped;
    private int mostWaiting;
    /** written on the writer thread only; read after it ended */
    private long failed;
    private String firstFailure;
    private long lastTimeMs;

    /**
     * Starts the writer thread.
     *
     * @param writer   the journal it writes; from now on used by the writer thread only (until close)
     * @param capacity entries that may wait, ≥ 1
     * @param name     the writer thread's name
     */
    public QueuedJournal(JournalWriter writer, int capacity, String name) {
        if (capacity < 1) {
            throw new IllegalArgumentException("journal queue capacity must be at least 1, got " + capacity);
        }
        this.writer = writer;
        this.capacity = capacity;
        this.queue = new ArrayBlockingQueue<>(capacity);
        this.thread = new Thread(this::drain, name);
        this.thread.setDaemon(true);
        this.thread.start();
    }

    /** Queues the entry, or counts it as dropped when the queue is full; ignored once closing. */
    @Override
    public synchronized void append(long tMs, String kind, Object fields) {
        if (closing) {
            return;
        }
        if (queue.offer(new Entry(tMs, kind, fields))) {
            queued++;
            lastTimeMs = tMs;
            mostWaiting = Math.max(mostWaiting, queue.size());
        } else {
            dropped++;
            droppedByKind.merge(kind, 1L, Long::sum);
        }
    }

    @Override
    public boolean isClosed() {
        return closing;
    }

    /** @return entries dropped so far because the queue was full */
    public synchronized long dropped() {
        return dropped;
    }

    /** @return entries queued so far */
    public synchronized long queued() {
        return queued;
    }

    private void drain() {
        while (true) {
            Entry e;
            try {
                e = queue.poll(POLL_MS, TimeUnit.MILLISECONDS);
            } catch (InterruptedException ex) {
                Thread.currentThread().interrupt();
                return;
            }
            if (e != null) {
                write(e);
            } else if (closing) {
                return; // closing and nothing left
            }
            writer.flushIfDue();
        }
    }

    private void write(Entry e) {
        try {
            writer.append(e.tMs(), e.kind(), e.fields());
        } catch (RuntimeException ex) {
            failed++;
            if (firstFailure == null) {
                firstFailure = e.kind() + ": " + ex.getMessage();
            }
        }
    }

    /**
     * Lets the writer thread write every queued entry, then writes the {@value #QUEUE_EVENT} event
     * and the end entry and closes the file. Later calls do nothing.
     *
     * @param tMs    scenario time of the end, epoch ms
     * @param reason why the run ended
     */
    public void close(long tMs, EndReason reason) {
        synchronized (this) {
            if (closing) {
                return;
            }
            closing = true;
        }
        try {
            thread.join();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            thread.interrupt();
        }
        for (Entry e; (e = queue.poll()) != null; ) {
            write(e); // left by an interrupted writer thread
        }
        writer.append(Math.max(tMs, lastTimeMs), JournalFormat.KIND_EVENT, figures());
        writer.close(Math.max(tMs, lastTimeMs), reason);
    }

    /** Closes with reason stopped at the time of the last entry queued. */
    @Override
    public void close() {
        close(lastTimeMs, EndReason.STOPPED);
    }

    private synchronized Map<String, Object> figures() {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", QUEUE_EVENT);
        f.put("capacity", capacity);
        f.put("queued", queued);
        f.put("dropped", dropped);
        f.put("droppedByKind", new TreeMap<>(droppedByKind));
        f.put("mostWaiting", mostWaiting);
        f.put("writeFailed", failed);
        if (firstFailure != null) {
            f.put("firstWriteFailure", firstFailure);
        }
        return f;
    }
}
