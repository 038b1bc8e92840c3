package org.loopstand.protocol.bus.mqtt;

import java.util.List;
import java.util.Objects;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Predicate;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.topic.TopicFilter;

/**
 * One logical bus over several {@link MqttLink}s, so that intake is not capped by one Paho callback
 * thread (≈ 20–30k msg/s for one subscriber on a 2-core machine). High-volume filters (chosen by
 * {@code shared}) are subscribed as MQTT 5 shared subscriptions {@code $share/{group}/{filter}} on every
 * link, and the broker deals each message to one of them; other filters (retained ones such as the
 * clock: a shared subscription never receives retained messages) go to the first link only.
 * Publishes are dealt round robin over the links, which multiplies the QoS 1 window (each link has its
 * own Receive Maximum).
 *
 * <p>Order: two messages on the same topic may arrive on different links and so in either order; the
 * receiver's per-source seq check drops the older one (counted as out of order). With scan periods of
 * a second or more against sub-millisecond delivery this is rare (counted, see docs/performance.md).
 *
 * <p>Connected = every link connected: a missing link means part of the intake is missing.
 */
public final class SharedSubscriptionBus implements MessageBus {
    private final List<MqttLink> links;
    private final String group;
    private final Predicate<String> shared;
    private final AtomicInteger next = new AtomicInteger();
    private final AtomicInteger up = new AtomicInteger();
    private final List<ConnectionListener> listeners = new CopyOnWriteArrayList<>();
    private volatile boolean everUp;

    /**
     * @param links  started or not yet started links to one broker, ≥ 1; owned (closed) by this bus
     * @param group  share group name (no wildcards, no '/')
     * @param shared which filters to subscribe shared on every link
     */
    public SharedSubscriptionBus(List<MqttLink> links, String group, Predicate<String> shared) {
        if (links.isEmpty()) {
            throw new IllegalArgumentException("at least one link is needed");
        }
        TopicFilter.stripShare("$share/" + group + "/x"); // validates the group name
        if (group.contains("/")) {
            throw new IllegalArgumentException("share group must not contain '/': " + group);
        }
        this.links = List.copyOf(links);
        this.group = group;
        this.shared = Objects.requireNonNull(shared, "shared");
        for (MqttLink l : this.links) {
            l.addConnectionListener(new ConnectionListener() {
                @Override
                public void onConnected(boolean reconnect) {
                    if (up.incrementAndGet() == SharedSubscriptionBus.this.links.size()) {
                        boolean again = everUp;
                        everUp = true;
                        listeners.forEach(x -> x.onConnected(again));
                    }
                }

                @Override
                public void onDisconnected(Throwable cause) {
                    if (up.getAndDecrement() == SharedSubscriptionBus.this.links.size()) {
                        listeners.forEach(x -> x.onDisconnected(cause));
                    }
                }
            });
        }
    }

    /** @return the links, in order; the first one carries the non-shared subscriptions */
    public List<MqttLink> links() {
        return links;
    }

    @Override
    public String clientId() {
        return links.get(0).clientId();
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        int i = Math.floorMod(next.getAndIncrement(), links.size());
        return links.get(i).publish(message);
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        if (shared.test(topicFilter)) {
            for (MqttLink l : links) {
                l.subscribe("$share/" + group + "/" + topicFilter, qos, listener);
            }
        } else {
            links.get(0).subscribe(topicFilter, qos, listener);
        }
    }

    @Override
    public void unsubscribe(String topicFilter) {
        if (shared.test(topicFilter)) {
            links.forEach(l -> l.unsubscribe("$share/" + group + "/" + topicFilter));
        } else {
            links.get(0).unsubscribe(topicFilter);
        }
    }

    @Override
    public boolean isConnected() {
        for (MqttLink l : links) {
            if (!l.isConnected()) {
                return false;
            }
        }
        return true;
    }

    @Override
    public void addConnectionListener(ConnectionListener listener) {
        listeners.add(Objects.requireNonNull(listener, "listener"));
    }

    /** @return counters summed over the links at the time of the call (a fresh snapshot object) */
    @Override
    public BusCounters counters() {
        BusCounters sum = new BusCounters();
        for (MqttLink l : links) {
            sum.addAll(l.counters());
        }
        return sum;
    }

    /** @return messages waiting in every link's delivery queue */
    public int receiveBacklog() {
        return links.stream().mapToInt(MqttLink::receiveBacklog).sum();
    }

    @Override
    public void close() {
        links.forEach(MqttLink::close);
    }
}
