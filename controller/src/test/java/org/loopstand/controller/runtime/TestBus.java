package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.topic.TopicFilter;

/**
 * TEMPORARY test scaffolding until the in-memory bus of the link work is merged: one shared
 * synchronous "broker" (a list of subscriptions) and connections onto it. Delivery happens on the
 * publishing thread; retained messages are kept and delivered on subscribe.
 */
final class TestBus {
    private final List<Sub> subs = new CopyOnWriteArrayList<>();
    private final Map<String, OutboundMessage> retained = new ConcurrentHashMap<>();
    final List<OutboundMessage> published = new CopyOnWriteArrayList<>();

    private record Sub(Connection owner, String filter, MessageListener listener) {
    }

    Connection connect(String clientId) {
        return new Connection(clientId);
    }

    final class Connection implements MessageBus {
        private final String clientId;
        private final BusCounters counters = new BusCounters();
        private final List<ConnectionListener> listeners = new CopyOnWriteArrayList<>();
        private volatile boolean connected = true;

        Connection(String clientId) {
            this.clientId = clientId;
        }

        @Override
        public String clientId() { return clientId; }

        @Override
        public CompletableFuture<Void> publish(OutboundMessage m) {
            if (!connected) {
                counters.onSendFailed();
                return CompletableFuture.failedFuture(new BusException(BusException.Reason.NOT_CONNECTED, "down"));
            }
            published.add(m);
            counters.onSent();
            if (m.retained()) {
                retained.put(m.topic(), m);
            }
            for (Sub s : subs) {
                if (s.owner.connected && TopicFilter.matches(s.filter, m.topic())) {
                    s.listener.onMessage(new InboundMessage(m.topic(), m.payload(), m.qos(), false, false, 0));
                }
            }
            return CompletableFuture.completedFuture(null);
        }

        @Override
        public void subscribe(String filter, Qos qos, MessageListener listener) {
            subs.add(new Sub(this, filter, listener));
            for (OutboundMessage m : new ArrayList<>(retained.values())) {
                if (TopicFilter.matches(filter, m.topic())) {
                    listener.onMessage(new InboundMessage(m.topic(), m.payload(), m.qos(), true, false, 0));
                }
            }
        }

        @Override
        public void unsubscribe(String filter) {
            subs.removeIf(s -> s.owner == this && s.filter.equals(filter));
        }

        @Override
        public boolean isConnected() { return connected; }

        @Override
        public void addConnectionListener(ConnectionListener l) { listeners.add(l); }

        @Override
        public BusCounters counters() { return counters; }

        @Override
        public void close() { connected = false; }

        /** Cuts or restores the link, telling the listeners. */
        void setConnected(boolean up) {
            connected = up;
            for (ConnectionListener l : listeners) {
                if (up) {
                    l.onConnected(true);
                } else {
                    l.onDisconnected(new RuntimeException("link cut by test"));
                }
            }
        }
    }
}
