package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;

import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;

/** A bus that keeps what is published, for looking at it afterwards. */
final class RecordingBus implements MessageBus {
    final List<OutboundMessage> sent = new ArrayList<>();
    private final BusCounters counters = new BusCounters();

    @Override
    public String clientId() {
        return "recording";
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        sent.add(message);
        counters.onSent();
        return CompletableFuture.completedFuture(null);
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
    }

    @Override
    public void unsubscribe(String topicFilter) {
    }

    @Override
    public boolean isConnected() {
        return true;
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
    }
}
