package org.loopstand.protocol.bus.memory;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
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
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * One client's connection to an {@link InMemoryBroker}; made with {@link InMemoryBroker#connect}.
 * Listeners run on the publisher's thread (DIRECT) or on the thread calling
 * {@link InMemoryBroker#deliverPending()} (LOCKSTEP), in order per subscription.
 */
public final class InMemoryBus implements MessageBus {
    /** One filter with its listeners in subscription order. */
    record Subscription(String filter, Qos qos, List<MessageListener> listeners) {
    }

    private static final Logger LOG = LoggerFactory.getLogger(InMemoryBus.class);

    private final InMemoryBroker broker;
    private final String clientId;
    private final OutboundMessage lastWill;
    private final BusCounters counters = new BusCounters();
    private final List<ConnectionListener> connectionListeners = new CopyOnWriteArrayList<>();
    private volatile List<Subscription> subscriptions = List.of();
    private volatile boolean connected = true;
    private volatile boolean closedForGood;

    InMemoryBus(InMemoryBroker broker, String clientId, OutboundMessage lastWill) {
        this.broker = broker;
        this.clientId = clientId;
        this.lastWill = lastWill;
    }

    @Override
    public String clientId() {
        return clientId;
    }

    OutboundMessage lastWill() {
        return lastWill;
    }

    List<Subscription> subscriptionsSnapshot() {
        return subscriptions;
    }

    /** Completes at once: the in-memory broker accepts every message while connected. */
    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        Objects.requireNonNull(message, "message");
        if (!connected) {
            counters.onSendFailed();
            return CompletableFuture.failedFuture(new BusException(BusException.Reason.CLOSED,
                    clientId + ": in-memory bus is closed"));
        }
        broker.publish(message);
        counters.onSent();
        return CompletableFuture.completedFuture(null);
    }

    /** @throws IllegalArgumentException for a malformed filter; IllegalStateException when closed */
    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        FilterMatch.validate(topicFilter);
        Objects.requireNonNull(qos, "qos");
        Objects.requireNonNull(listener, "listener");
        if (!connected) {
            throw new IllegalStateException(clientId + ": in-memory bus is closed");
        }
        synchronized (this) {
            List<Subscription> next = new ArrayList<>();
            boolean found = false;
            for (Subscription s : subscriptions) {
                if (s.filter().equals(topicFilter)) {
                    List<MessageListener> ls = new ArrayList<>(s.listeners());
                    ls.add(listener);
                    next.add(new Subscription(s.filter(), qos.level() > s.qos().level() ? qos : s.qos(), List.copyOf(ls)));
                    found = true;
                } else {
                    next.add(s);
                }
            }
            if (!found) {
                next.add(new Subscription(topicFilter, qos, List.of(listener)));
            }
            subscriptions = List.copyOf(next);
        }
        broker.subscriptionsChanged();
        broker.onSubscribed(this, topicFilter, qos);
    }

    @Override
    public void unsubscribe(String topicFilter) {
        synchronized (this) {
            subscriptions = subscriptions.stream().filter(s -> !s.filter().equals(topicFilter)).toList();
        }
        broker.subscriptionsChanged(); // not under this bus's lock: the broker's lock is taken before it elsewhere
    }

    void deliver(String filter, InboundMessage message) {
        if (!connected) {
            return;
        }
        for (Subscription s : subscriptions) {
            if (s.filter().equals(filter)) {
                counters.onReceived();
                for (MessageListener l : s.listeners()) {
                    try {
                        l.onMessage(message);
                    } catch (RuntimeException e) {
                        counters.onRejected();
                        LOG.warn("{}: listener of {} failed on a message from {}: {}", clientId, filter,
                                message.topic(), e.toString());
                    }
                }
                return;
            }
        }
        counters.onDropped(); // unsubscribed while the message was queued
    }

    @Override
    public boolean isConnected() {
        return connected;
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        connectionListeners.add(Objects.requireNonNull(listener, "listener"));
    }

    @Override
    public BusCounters counters() {
        return counters;
    }

    /** Disconnects cleanly for good: the last will is discarded; {@link #reconnect()} is refused after. */
    @Override
    public void close() {
        closedForGood = true;
        end(false, null);
    }

    /**
     * Drops the connection as a rehearsal fault does, keeping the subscriptions for {@link #reconnect()}.
     *
     * @param publishWill true: as a cut connection (the broker publishes the last will); false: as a clean DISCONNECT
     */
    public void drop(boolean publishWill) {
        end(publishWill, new IllegalStateException(clientId + (publishWill ? " cut" : " disconnected")));
    }

    /**
     * Connects again after {@link #drop} or {@link #kill()}: subscribes everything again (retained messages
     * are delivered anew, as after an MQTT reconnect with a clean start) and tells the connection
     * listeners {@code onConnected(true)}. No effect while connected.
     *
     * @throws IllegalStateException after {@link #close()}, or when another client took the id meanwhile
     */
    public void reconnect() {
        if (closedForGood) {
            throw new IllegalStateException(clientId + ": in-memory bus is closed");
        }
        synchronized (this) {
            if (connected) {
                return;
            }
            broker.reattach(this);
            connected = true;
        }
        for (Subscription s : subscriptions) {
            broker.onSubscribed(this, s.filter(), s.qos());
        }
        counters.onReconnect();
        for (ConnectionListener l : connectionListeners) {
            l.onConnected(true);
        }
    }

    /** Vanishes without a clean disconnect, as a crashed process would: the broker publishes the last will. */
    public void kill() {
        end(true, new IllegalStateException(clientId + " killed"));
    }

    private void end(boolean publishWill, Throwable cause) {
        synchronized (this) {
            if (!connected) {
                return;
            }
            connected = false;
        }
        broker.disconnect(this, publishWill);
        for (ConnectionListener l : connectionListeners) {
            l.onDisconnected(cause);
        }
    }
}
