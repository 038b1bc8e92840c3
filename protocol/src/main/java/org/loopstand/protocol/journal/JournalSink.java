package org.loopstand.protocol.journal;

/** Where journal entries go: a {@link JournalWriter} directly, or a {@link QueuedJournal} in front of one. */
public interface JournalSink {
    /**
     * Appends one entry.
     *
     * @param tMs    scenario time of the entry, epoch ms
     * @param kind   entry kind, see {@link JournalFormat}
     * @param fields a {@code Map} or any object Jackson serializes to a JSON object; no {@code t} or {@code kind}
     */
    void append(long tMs, String kind, Object fields);

    /** @return true once closed (later entries are refused or ignored) */
    boolean isClosed();
}
