package org.loopstand.protocol.codec;

import java.util.Arrays;
import org.loopstand.protocol.message.FaultOrder;

/**
 * The last messages {@link MessageCodec#encode encoded} on one thread, so that a
 * {@link MessageCodec#decode decode} of the same bytes on that thread hands back the encoded record
 * instead of parsing and checking it again. For lockstep runs, where publisher and subscriber share
 * one thread and every message is encoded and decoded within the same step (docs/lockstep.md).
 *
 * <p>Why the answer is the same: a record is remembered only after {@code encode} checked it and
 * wrote its bytes; the records are immutable; and decoding a message's bytes gives a record equal to
 * the one encoded (the codec's round-trip property, {@code MessageCodecRoundTripTest}). Only bytes
 * equal to the encoded ones, asked for as the encoded type, are answered; anything else (bytes a
 * fault stage changed, another type, a payload over the receiver's size limit, which {@code decode}
 * refuses before asking) is parsed as always. Fault orders are not remembered: their free-form
 * parameters are a mutable map whose number types a round trip may change.
 *
 * <p>Off unless a thread {@link #openOnThisThread() opens} it; MQTT processes never do. Not shared
 * between threads: each thread has its own, so campaign workers stay independent.
 */
public final class RecentEncodings implements AutoCloseable {
    /** How many encodings are kept: a lockstep delivery decodes within a few publishes of its encode. */
    static final int KEPT = 64;

    private static final ThreadLocal<RecentEncodings> ON_THREAD = new ThreadLocal<>();

    private final RecentEncodings outer;
    private final Thread owner;
    private final byte[][] payloads = new byte[KEPT][];
    private final int[] hashes = new int[KEPT];
    private final Decoded.Ok<?>[] records = new Decoded.Ok<?>[KEPT];
    private int next;
    private long answered;

    private RecentEncodings(RecentEncodings outer, Thread owner) {
        this.outer = outer;
        this.owner = owner;
    }

    /**
     * Starts remembering on the calling thread until {@link #close()} (on the same thread).
     *
     * @return the open memory; close it when the run ends
     */
    public static RecentEncodings openOnThisThread() {
        RecentEncodings opened = new RecentEncodings(ON_THREAD.get(), Thread.currentThread());
        ON_THREAD.set(opened);
        return opened;
    }

    /** @return the memory open on this thread, or null */
    static RecentEncodings onThisThread() {
        return ON_THREAD.get();
    }

    /** @return decodes answered from memory since it was opened */
    public long answered() {
        return answered;
    }

    void remember(byte[] payload, Object message) {
        if (message instanceof FaultOrder) {
            return;
        }
        // A copy: the publisher's array may be changed after encoding (a fault stage garbling it).
        payloads[next] = payload.clone();
        hashes[next] = Arrays.hashCode(payload);
        records[next] = new Decoded.Ok<>(message);
        next = (next + 1) % KEPT;
    }

    /** @return the encoded record when these bytes were encoded from a record of this type, else null */
    @SuppressWarnings("unchecked")
    <T> Decoded<T> find(byte[] payload, Class<T> type) {
        int hash = Arrays.hashCode(payload);
        // newest first: a delivery follows its encode closely
        for (int k = 1; k <= KEPT; k++) {
            int i = Math.floorMod(next - k, KEPT);
            Decoded.Ok<?> record = records[i];
            if (record == null) {
                return null;
            }
            if (hashes[i] == hash && record.value().getClass() == type && Arrays.equals(payloads[i], payload)) {
                answered++;
                return (Decoded<T>) record;
            }
        }
        return null;
    }

    /** Stops remembering on this thread (the memory open before this one, if any, is in force again). */
    @Override
    public void close() {
        if (Thread.currentThread() != owner) {
            throw new IllegalStateException("recent encodings are closed by the thread that opened them");
        }
        if (outer == null) {
            ON_THREAD.remove();
        } else {
            ON_THREAD.set(outer);
        }
    }
}
