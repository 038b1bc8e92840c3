package org.loopstand.protocol.bus.mqtt;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.Qos;

/**
 * The link's own record of its subscriptions: the source for resubscribing after every reconnect and
 * for routing a received message to listeners (messages of a resumed session can arrive before the
 * SUBACK, so routing must not depend on Paho's per-subscription listeners). Thread-safe.
 */
final class SubscriptionTable {
    /** One filter with its QoS and listeners in the order they subscribed. */
    record Entry(String filter, Qos qos, List<MessageListener> listeners) {
    }

    private final Map<String, Entry> byFilter = new LinkedHashMap<>();
    private volatile List<Entry> snapshot = List.of();

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

    /** @return entries whose filter matches the topic, in subscription order */
    List<Entry> matching(String topic) {
        List<Entry> result = new ArrayList<>(2);
        for (Entry e : snapshot) {
            if (MqttTopicValidator.isMatched(e.filter(), topic)) {
                result.add(e);
            }
        }
        return result;
    }

    private void refresh() {
        snapshot = List.copyOf(byFilter.values());
    }
}
