package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
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
 * Test-only stand-in for the in-memory broker until the link branch lands: synchronous delivery on the
 * publisher's thread, retained messages, last will on {@link Client#kill()}. Not for concurrent use.
 */
final class LoopbackBroker implements LinkFactory {
    final Map<String, OutboundMessage> retained = new LinkedHashMap<>();
    final List<OutboundMessage> published = new CopyOnWriteArrayList<>();
    final List<Client> clients = new ArrayList<>();

    @Override
    public Client connect(String clientId, OutboundMessage lastWill) {
        Client c = new Client(clientId, lastWill);
        clients.add(c);
        return c;
    }

    void publish(OutboundMessage m) {
        published.add(m);
        if (m.retained()) {
            retained.put(m.topic(), m);
        }
        for (Client c : List.copyOf(clients)) {
            c.deliver(m, false);
        }
    }

    List<OutboundMessage> on(String topic) {
        return published.stream().filter(m -> m.topic().equals(topic)).toList();
    }

    final class Client implements MessageBus {
        final String clientId;
        final OutboundMessage will;
        final Map<String, MessageListener> subs = new LinkedHashMap<>();
        final BusCounters counters = new BusCounters();
        boolean connected = true;

        Client(String clientId, OutboundMessage will) {
            this.clientId = clientId;
            this.will = will;
        }

        void deliver(OutboundMessage m, boolean asRetained) {
            if (!connected) {
                return;
            }
            for (var e : List.copyOf(subs.entrySet())) {
                if (TopicFilter.matches(e.getKey(), m.topic())) {
                    e.getValue().onMessage(new InboundMessage(m.topic(), m.payload(), m.qos(), asRetained, false, 0));
                }
            }
        }

        void kill() {
            connected = false;
            clients.remove(this);
            if (will != null) {
                publish(will);
            }
        }

        @Override public String clientId() { return clientId; }

        @Override
        public CompletableFuture<Void> publish(OutboundMessage message) {
            if (!connected) {
                return CompletableFuture.failedFuture(new BusException(BusException.Reason.NOT_CONNECTED, "down"));
            }
            LoopbackBroker.this.publish(message);
            return CompletableFuture.completedFuture(null);
        }

        @Override
        public void subscribe(String filter, Qos qos, MessageListener listener) {
            subs.put(filter, listener);
            for (OutboundMessage r : List.copyOf(retained.values())) {
                if (TopicFilter.matches(filter, r.topic())) {
                    listener.onMessage(new InboundMessage(r.topic(), r.payload(), r.qos(), true, false, 0));
                }
            }
        }

        @Override public void unsubscribe(String filter) { subs.remove(filter); }
        @Override public boolean isConnected() { return connected; }
        @Override public void addConnectionListener(ConnectionListener l) { }
        @Override public BusCounters counters() { return counters; }
        @Override public void close() { connected = false; clients.remove(this); }
    }
}
