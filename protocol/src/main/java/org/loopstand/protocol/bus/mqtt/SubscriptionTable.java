package org.loopstand.protocol.bus.mqtt;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.topic.TopicFilter;

/**
 * The link's own record of its subscriptions: the source for resubscribing after every reconnect and
 * for routing a received message to listeners (messages of a resumed session can arrive before the
 * SUBACK, so routing must not depend on Paho's per-subscription listeners). Thread-safe.
 *
 * <p>Routing: a shared subscription {@code $share/{group}/{filter}} routes like its filter (Paho's
 * matcher does not know the prefix and would match nothing). Filters without wildcards sit in a hash
 * map, so a pooled plant connection serving thousands of units' command topics routes in O(1), not
 * by scanning every filter.
 */
final class SubscriptionTable {
    /** One filter with its QoS and listeners in the order they subscribed. */
    record Entry(String filter, Qos qos, List<MessageListener> listeners, String routingFilter) {
        Entry(String filter, Qos qos, List<MessageListener> listeners) {
            this(filter, qos, listeners, TopicFilter.stripShare(filter));
        }

        boolean exact() {
            return routingFilter.indexOf('+') < 0 && routingFilter.indexOf('#') < 0;
        }
    }

    private final Map<String, Entry> byFilter = new LinkedHashMap<>();
    private volatile List<Entry> snapshot = List.of();
    /** routing filter (no wildcard) → entries; entries with wildcards are in {@link #wildcards}. */
    private volatile Map<String, List<Entry>> exact = Map.of();
    private volatile List<Entry> wildcards = List.of();

    /** @return true when the filter is new (the broker must be told), false when a listener was added */
    synchronized boolean add(String filter, Qos qos, MessageListener listener) {
        Entry old = byFilter.get(filter);
        List<MessageListener> listeners = new ArrayList<>(old == null ? List.of() : old.listeners());
        listeners.add(listener);
        Qos effective = old != null && old.qos().level() > qos.level() ? old.qos() : qos;
        byFilter.put(filter, new Entry(filter, effective, List.copyOf(listeners)));
        refresh();
        return old == null || old.qos() != effective;
    }

    synchronized boolean remove(String filter) {
        boolean removed = byFilter.remove(filter) != null;
        refresh();
        return removed;
    }

    /** @return all entries in subscription order */
    List<Entry> entries() {
        return snapshot;
    }

    Entry get(String filter) {
        for (Entry e : snapshot) {
            if (e.filter().equals(filter)) {
                return e;
            }
        }
        return null;
    }

    /** @return entries whose filter matches the topic (exact filters first, then wildcards in subscription order) */
    List<Entry> matching(String topic) {
        List<Entry> direct = exact.get(topic);
        List<Entry> result = new ArrayList<>(direct == null ? 2 : direct.size() + 1);
        if (direct != null) {
            result.addAll(direct);
        }
        for (Entry e : wildcards) {
            if (MqttTopicValidator.isMatched(e.routingFilter(), topic)) {
                result.add(e);
            }
        }
        return result;
    }

    private void refresh() {
        snapshot = List.copyOf(byFilter.values());
        Map<String, List<Entry>> ex = new HashMap<>();
        List<Entry> wild = new ArrayList<>();
        for (Entry e : snapshot) {
            if (e.exact()) {
                ex.computeIfAbsent(e.routingFilter(), k -> new ArrayList<>(1)).add(e);
            } else {
                wild.add(e);
            }
        }
        exact = ex;
        wildcards = List.copyOf(wild);
    }
}
