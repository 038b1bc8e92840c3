package org.loopstand.controller.pulsetest;

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
import org.loopstand.protocol.topic.TopicFilter;

/**
 * Test double: a synchronous bus whose connections share one subscription table, so a deterministic
 * test runs a unit model and the runner in one thread. Messages are delivered during publish.
 */
final class DirectBus implements MessageBus {
    /** The shared table. */
    static final class Broker {
        final List<Map.Entry<String, MessageListener>> subs = new ArrayList<>();
        final List<OutboundMessage> published = new ArrayList<>();
    }

    private final Broker broker;
    private final String clientId;
    private final Map<String, MessageListener> mine = new LinkedHashMap<>();
    private final BusCounters counters = new BusCounters();
    boolean connected = true;

    DirectBus(Broker broker, String clientId) {
        this.broker = broker;
        this.clientId = clientId;
    }

    @Override
    public String clientId() {
        return clientId;
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        broker.published.add(message);
        counters.onSent();
        for (Map.Entry<String, MessageListener> s : List.copyOf(broker.subs)) {
            if (TopicFilter.matches(s.getKey(), message.topic())) {
                s.getValue().onMessage(new InboundMessage(message.topic(), message.payload(), message.qos(),
                        false, false, 0));
            }
        }
        return CompletableFuture.completedFuture(null);
    }

    @Override
    public void subscribe(String topicFilter, org.loopstand.protocol.bus.Qos qos, MessageListener listener) {
        mine.put(topicFilter, listener);
        broker.subs.add(Map.entry(topicFilter, listener));
    }

    @Override
    public void unsubscribe(String topicFilter) {
        MessageListener l = mine.remove(topicFilter);
        broker.subs.removeIf(e -> e.getKey().equals(topicFilter) && e.getValue() == l);
    }

    @Override
    public boolean isConnected() {
        return connected;
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
    }

    @Override
    public BusCounters counters() {
        return counters;
    }

    @Override
    public void close() {
        for (String f : List.copyOf(mine.keySet())) {
            unsubscribe(f);
        }
    }
}
