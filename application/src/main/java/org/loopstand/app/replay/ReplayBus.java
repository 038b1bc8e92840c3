package org.loopstand.app.replay;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;

import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.topic.TopicFilter;

/**
 * The bus a replayed controller sits on: no broker, no thread. The replay hands it each journaled input
 * ({@link #deliver}), which goes to the subscription it matches, as a broker would have delivered it;
 * publishes succeed at once and go nowhere (the journal, not the bus, is what replay compares); link
 * changes happen when the journal says they did ({@link #linkDown}, {@link #linkUp}). Single thread.
 */
final class ReplayBus implements MessageBus {
    private final String clientId;
    private final Map<String, MessageListener> subscriptions = new LinkedHashMap<>();
    private final List<ConnectionListener> connectionListeners = new ArrayList<>();
    private final BusCounters counters = new BusCounters();
    private boolean connected;
    private long published;

    /** @param connected whether the link is up when the controller starts */
    ReplayBus(String clientId, boolean connected) {
        this.clientId = clientId;
        this.connected = connected;
    }

    /**
     * Hands one input to the subscription whose filter matches its topic.
     *
     * @return false when no subscription matches (the controller could not have received it)
     */
    boolean deliver(String topic, byte[] payload, long monotonicNs) {
        for (Map.Entry<String, MessageListener> s : subscriptions.entrySet()) {
            if (TopicFilter.matches(s.getKey(), topic)) {
                counters.onReceived();
                s.getValue().onMessage(new InboundMessage(topic, payload, Qos.AT_LEAST_ONCE, false, false, monotonicNs));
                return true;
            }
        }
        return false;
    }

    /** The link goes down; {@code cause} as the journal wrote it. */
    void linkDown(String cause) {
        connected = false;
        Throwable t = new RecordedCause(cause);
        connectionListeners.forEach(l -> l.onDisconnected(t));
    }

    /** The link comes (back) up. */
    void linkUp(boolean reconnect) {
        connected = true;
        connectionListeners.forEach(l -> l.onConnected(reconnect));
    }

    /** @return messages the controller published (statuses and commands) */
    long published() {
        return published;
    }

    @Override
    public String clientId() {
        return clientId;
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        published++;
        counters.onSent();
        return CompletableFuture.completedFuture(null);
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        subscriptions.put(topicFilter, listener);
    }

    @Override
    public void unsubscribe(String topicFilter) {
        subscriptions.remove(topicFilter);
    }

    @Override
    public boolean isConnected() {
        return connected;
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        connectionListeners.add(listener);
    }

    @Override
    public BusCounters counters() {
        return counters;
    }

    @Override
    public void close() {
        connected = false;
    }

    /** A link-down cause that prints as the journal recorded it (the controller journals {@code String.valueOf(cause)}). */
    private static final class RecordedCause extends Exception {
        private final String text;

        RecordedCause(String text) {
            super(text, null, false, false);
            this.text = text;
        }

        @Override
        public String toString() {
            return text;
        }
    }
}
