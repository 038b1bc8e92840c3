package org.loopstand.protocol.bus;

import java.util.concurrent.atomic.LongAdder;

/** Counters a bus connection keeps; read at any time from any thread. */
public final class BusCounters {
    private final LongAdder received = new LongAdder();
    private final LongAdder rejected = new LongAdder();
    private final LongAdder sent = new LongAdder();
    private final LongAdder sendFailed = new LongAdder();
    private final LongAdder reconnects = new LongAdder();
    private final LongAdder dropped = new LongAdder();

    public void onReceived() {
        received.increment();
    }

    /** A received message the application refused (bad payload, wrong topic). */
    public void onRejected() {
        rejected.increment();
    }

    public void onSent() {
        sent.increment();
    }

    public void onSendFailed() {
        sendFailed.increment();
    }

    public void onReconnect() {
        reconnects.increment();
    }

    /**
     * A received message that never reached a listener: the receive queue was full (the application
     * is too slow) or no subscription matched its topic.
     */
    public void onDropped() {
        dropped.increment();
    }

    /** Adds another connection's counts to these (for a bus made of several connections). */
    public void addAll(BusCounters other) {
        received.add(other.received());
        rejected.add(other.rejected());
        sent.add(other.sent());
        sendFailed.add(other.sendFailed());
        reconnects.add(other.reconnects());
        dropped.add(other.dropped());
    }

    public long received() {
        return received.sum();
    }

    public long rejected() {
        return rejected.sum();
    }

    public long sent() {
        return sent.sum();
    }

    public long sendFailed() {
        return sendFailed.sum();
    }

    public long reconnects() {
        return reconnects.sum();
    }

    public long dropped() {
        return dropped.sum();
    }

    @Override
    public String toString() {
        return "received=" + received() + " rejected=" + rejected() + " dropped=" + dropped() + " sent=" + sent()
                + " sendFailed=" + sendFailed() + " reconnects=" + reconnects();
    }
}
