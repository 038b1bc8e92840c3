package org.loopstand.protocol.bus;

import java.util.concurrent.CompletableFuture;

/**
 * What the rig needs from a publish/subscribe bus. Implemented by the MQTT link (Paho v5, a real
 * broker) and by the in-memory bus (study mode and unit tests), so domain code does not know which.
 */
public interface MessageBus extends AutoCloseable {
    /** @return this connection's client id */
    String clientId();

    /**
     * Publishes without blocking. The future completes when the message has left (QoS 0) or has been
     * acknowledged by the broker (QoS 1), and fails with a {@link BusException} naming the reason
     * (not connected, back-pressure, refused). Nothing is dropped silently.
     */
    CompletableFuture<Void> publish(OutboundMessage message);

    /**
     * Subscribes; the subscription is renewed by the bus after every reconnect.
     *
     * @param topicFilter MQTT filter, may use + and #
     * @param qos         maximum QoS to receive with
     * @param listener    called off the transport thread, in order per subscription
     */
    void subscribe(String topicFilter, Qos qos, MessageListener listener);

    /** Removes a subscription made with {@link #subscribe}. */
    void unsubscribe(String topicFilter);

    /** @return true while the bus can carry messages */
    boolean isConnected();

    void addConnectionListener(ConnectionListener listener);

    /** @return live counters of this connection */
    BusCounters counters();

    /** Disconnects cleanly (no last will) and releases threads. */
    @Override
    void close();
}
