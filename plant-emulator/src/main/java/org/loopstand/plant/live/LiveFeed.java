package org.loopstand.plant.live;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;

/**
 * The hand-over from the plant thread to the HTTP threads: the last {@code capacity} snapshots. The
 * plant thread only appends (a short lock, never a wait); readers wait for a newer snapshot with a
 * timeout. Nothing here can slow the physics beyond one short lock per snapshot.
 */
public final class LiveFeed {
    private final int capacity;
    private final ArrayDeque<LiveSnapshot> ring;
    private long latestSeq;

    /** @param capacity snapshots kept, ≥ 1 (at 4 per wall second, 2400 = 10 wall minutes) */
    public LiveFeed(int capacity) {
        if (capacity < 1) {
            throw new IllegalArgumentException("capacity must be at least 1, got " + capacity);
        }
        this.capacity = capacity;
        this.ring = new ArrayDeque<>(capacity);
    }

    /** Plant thread: appends one snapshot, dropping the oldest when full. */
    public synchronized void offer(LiveSnapshot s) {
        if (ring.size() == capacity) {
            ring.removeFirst();
        }
        ring.addLast(s);
        latestSeq = s.seq();
        notifyAll();
    }

    /** @return the snapshots kept, oldest first */
    public synchronized List<LiveSnapshot> history() {
        return new ArrayList<>(ring);
    }

    /** @return the newest snapshot, or null before the first */
    public synchronized LiveSnapshot latest() {
        return ring.peekLast();
    }

    /**
     * Waits until a snapshot newer than {@code afterSeq} is there, at most {@code timeoutMs}.
     *
     * @return the snapshots newer than {@code afterSeq}, oldest first (empty on timeout)
     */
    public synchronized List<LiveSnapshot> awaitNewer(long afterSeq, long timeoutMs) throws InterruptedException {
        if (latestSeq <= afterSeq && timeoutMs > 0) {
            wait(timeoutMs); // one wake-up is enough: the caller loops
        }
        List<LiveSnapshot> out = new ArrayList<>();
        for (LiveSnapshot s : ring) {
            if (s.seq() > afterSeq) {
                out.add(s);
            }
        }
        return out;
    }
}
