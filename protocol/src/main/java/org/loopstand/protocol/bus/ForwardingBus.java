package org.loopstand.protocol.bus;

import java.util.Objects;
import java.util.concurrent.CompletableFuture;

/**
 * A bus that passes every call to another bus. Probes and test taps extend it and override only
 * what they watch or change (usually {@link #publish} or {@link #subscribe}).
 */
public abstract class ForwardingBus implements MessageBus {
    /** The bus every call goes to. */
    protected final MessageBus inner;

    protected ForwardingBus(MessageBus inner) {
        this.inner = Objects.requireNonNull(inner, "inner");
    }

    @Override
    public String clientId() {
        return inner.clientId();
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        return inner.publish(message);
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        inner.subscribe(topicFilter, qos, listener);
    }

    @Override
    public void unsubscribe(String topicFilter) {
        inner.unsubscribe(topicFilter);
    }

    @Override
    public boolean isConnected() {
        return inner.isConnected();
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        inner.addConnectionListener(listener);
    }

    @Override
    public BusCounters counters() {
        return inner.counters();
    }

    @Override
    public void close() {
        inner.close();
    }
}
