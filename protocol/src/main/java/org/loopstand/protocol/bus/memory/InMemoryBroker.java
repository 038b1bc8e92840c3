package org.loopstand.protocol.bus.memory;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.concurrent.atomic.LongAdder;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.time.Clock;

/**
 * A broker inside the JVM for study mode and tests: MQTT filter matching, retained messages, last
 * will, message expiry against the broker's {@link Clock}. No sessions survive a disconnect; QoS only
 * caps the delivered QoS (delivery is always in publish order). Thread-safe.
 */
public final class InMemoryBroker {
    /** Largest number of deliveries one {@link #deliverPending()} may make (guards publish loops). */
    public static final int MAX_DELIVERIES_PER_ROUND = 1_000_000;
    /** Most topics whose subscriptions are kept (a site has a few hundred). */
    private static final int MAX_TOPICS_KEPT = 10_000;

    /** A message held by the broker with the time it was published. */
    private record Stored(OutboundMessage message, long publishedNanos) {
        boolean expiredAt(long nowNanos) {
            return message.expirySeconds() > 0 && nowNanos - publishedNanos >= message.expirySeconds() * 1_000_000_000L;
        }
    }

    /** One subscription a topic reaches. */
    private record Target(InMemoryBus client, InMemoryBus.Subscription subscription) {
    }

    /** A message on its way to one subscription. */
    private record Pending(InMemoryBus subscriber, String filter, Stored stored, Qos qos, boolean retained) {
    }

    private final Clock clock;
    private final DeliveryMode mode;
    private final Map<String, InMemoryBus> clients = new LinkedHashMap<>();
    private final Map<String, Stored> retained = new LinkedHashMap<>();
    private final ArrayDeque<Pending> pending = new ArrayDeque<>();
    /**
     * The subscriptions each published topic reaches, in delivery order (clients in connection order,
     * then their subscriptions): a lockstep run publishes on a few hundred topics thousands of times.
     * Emptied whenever a client connects or leaves or a subscription changes.
     */
    private final Map<String, List<Target>> targetsByTopic = new HashMap<>();
    private final LongAdder expired = new LongAdder();

    public InMemoryBroker(Clock clock, DeliveryMode mode) {
        this.clock = Objects.requireNonNull(clock, "clock");
        this.mode = Objects.requireNonNull(mode, "mode");
    }

    /** @throws IllegalStateException when the client id is already connected */
    public InMemoryBus connect(String clientId) {
        return connect(clientId, null);
    }

    /**
     * @param lastWill published when the bus is {@link InMemoryBus#kill() killed}, not on close; may be null
     * @throws IllegalStateException when the client id is already connected
     */
    public synchronized InMemoryBus connect(String clientId, OutboundMessage lastWill) {
        if (clientId == null || clientId.isEmpty()) {
            throw new IllegalArgumentException("clientId must not be empty");
        }
        if (lastWill != null) {
            FilterMatch.validateTopic(lastWill.topic());
        }
        if (clients.containsKey(clientId)) {
            throw new IllegalStateException("client id '" + clientId + "' is already connected");
        }
        InMemoryBus bus = new InMemoryBus(this, clientId, lastWill);
        clients.put(clientId, bus);
        targetsByTopic.clear();
        return bus;
    }

    /** Takes a dropped client back under its id ({@link InMemoryBus#reconnect()}). */
    synchronized void reattach(InMemoryBus bus) {
        if (clients.containsKey(bus.clientId())) {
            throw new IllegalStateException("client id '" + bus.clientId() + "' is already connected");
        }
        clients.put(bus.clientId(), bus);
        targetsByTopic.clear();
    }

    /** A client's subscriptions changed (called after the change, without the client's lock held). */
    synchronized void subscriptionsChanged() {
        targetsByTopic.clear();
    }

    public DeliveryMode mode() {
        return mode;
    }

    Clock clock() {
        return clock;
    }

    /** @return messages queued for {@link #deliverPending()} (always 0 in DIRECT mode) */
    public synchronized int pendingCount() {
        return pending.size();
    }

    /** @return messages not delivered because their expiry interval had passed */
    public long expiredCount() {
        return expired.sum();
    }

    /** @return the retained message of a topic, if any and not expired */
    public synchronized java.util.Optional<OutboundMessage> retained(String topic) {
        Stored s = retained.get(topic);
        return s == null || s.expiredAt(clock.monotonicNanos()) ? java.util.Optional.empty()
                : java.util.Optional.of(s.message());
    }

    /**
     * LOCKSTEP: delivers everything queued in FIFO order, including what listeners publish meanwhile,
     * on the calling thread.
     *
     * @return messages delivered
     * @throws IllegalStateException after {@link #MAX_DELIVERIES_PER_ROUND} deliveries (a publish loop)
     */
    public int deliverPending() {
        int delivered = 0;
        while (true) {
            Pending next;
            synchronized (this) {
                next = pending.poll();
            }
            if (next == null) {
                return delivered;
            }
            if (++delivered > MAX_DELIVERIES_PER_ROUND) {
                throw new IllegalStateException("more than " + MAX_DELIVERIES_PER_ROUND
                        + " deliveries in one round: listeners keep publishing in a loop");
            }
            deliver(next);
        }
    }

    void publish(OutboundMessage message) {
        FilterMatch.validateTopic(message.topic());
        List<Pending> targets = new ArrayList<>();
        synchronized (this) {
            Stored stored = new Stored(message, clock.monotonicNanos());
            if (message.retained()) {
                // An empty retained payload clears the topic's retained value (MQTT rule).
                if (message.payload().length == 0) {
                    retained.remove(message.topic());
                } else {
                    retained.put(message.topic(), stored);
                }
            }
            for (Target t : targetsOf(message.topic())) {
                InMemoryBus.Subscription sub = t.subscription();
                targets.add(new Pending(t.client(), sub.filter(), stored, lower(message.qos(), sub.qos()), false));
            }
            if (mode == DeliveryMode.LOCKSTEP) {
                pending.addAll(targets);
                return;
            }
        }
        targets.forEach(this::deliver);
    }

    /** Caller holds this broker's lock. */
    private List<Target> targetsOf(String topic) {
        List<Target> known = targetsByTopic.get(topic);
        if (known != null) {
            return known;
        }
        List<Target> found = new ArrayList<>();
        for (InMemoryBus client : clients.values()) {
            for (InMemoryBus.Subscription sub : client.subscriptionsSnapshot()) {
                if (FilterMatch.matches(sub.filter(), topic)) {
                    found.add(new Target(client, sub));
                }
            }
        }
        if (targetsByTopic.size() >= MAX_TOPICS_KEPT) {
            targetsByTopic.clear();
        }
        targetsByTopic.put(topic, found);
        return found;
    }

    /** Queues (LOCKSTEP) or delivers (DIRECT) the retained messages matching a new subscription. */
    void onSubscribed(InMemoryBus client, String filter, Qos qos) {
        List<Pending> targets = new ArrayList<>();
        synchronized (this) {
            for (Stored s : retained.values()) {
                if (FilterMatch.matches(filter, s.message().topic())) {
                    targets.add(new Pending(client, filter, s, lower(s.message().qos(), qos), true));
                }
            }
            if (mode == DeliveryMode.LOCKSTEP) {
                pending.addAll(targets);
                return;
            }
        }
        targets.forEach(this::deliver);
    }

    synchronized void disconnect(InMemoryBus client, boolean publishWill) {
        clients.remove(client.clientId(), client);
        targetsByTopic.clear();
        pending.removeIf(p -> p.subscriber() == client);
        if (publishWill && client.lastWill() != null) {
            // publish() takes the lock again (reentrant); DIRECT delivery then runs under it: wills are rare.
            publish(client.lastWill());
        }
    }

    private void deliver(Pending p) {
        if (p.stored().expiredAt(clock.monotonicNanos())) {
            expired.increment();
            return;
        }
        OutboundMessage m = p.stored().message();
        p.subscriber().deliver(p.filter(), new InboundMessage(m.topic(), m.payload().clone(), p.qos(), p.retained(),
                false, clock.monotonicNanos()));
    }

    private static Qos lower(Qos a, Qos b) {
        return a.level() <= b.level() ? a : b;
    }
}
