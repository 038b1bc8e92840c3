package org.loopstand.protocol.topic;

import java.util.EnumMap;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.Qos;

/**
 * One wildcard subscription per topic kind for the many units a process serves, each message handed to its
 * unit's listener by taking its topic apart ({@link TopicTree#parse}). A broker that makes a queue per
 * subscription (Artemis, and telling its cluster peers of each) then makes one per kind and connection instead
 * of one per unit: at 10,000 units per-unit subscriptions took the nodes many minutes (docs/broker.md).
 *
 * <p>Units subscribe through a {@link #view} exactly as they would on a connection of their own (the unit's
 * own topic of a routed kind); the view registers them here instead of subscribing. A message whose unit is
 * served by no listener here (another host's unit: the wildcard covers the whole site) is dropped and counted
 * ({@link #notServedCount}); a topic that is not a routed topic of this site is dropped and counted
 * ({@link #notParsedCount}). A message is never handed to another unit's listener: the unit comes from the
 * topic the broker delivered it on.
 *
 * <p>The wildcard needs read access to every unit's topic of that kind (a broker ACL per unit refuses it):
 * use it for connections whose login may read them, keep per-unit subscriptions for a unit alone.
 */
public final class UnitTopicRouter {
    private final TopicTree topics;
    private final Map<TopicKind, Map<String, MessageListener>> routes = new EnumMap<>(TopicKind.class);
    private final LongAdder notServed = new LongAdder();
    private final LongAdder notParsed = new LongAdder();
    private final LongAdder routed = new LongAdder();

    /** @param site the site id whose unit topics are routed */
    public UnitTopicRouter(String site) {
        this.topics = TopicTree.forSite(site);
    }

    /**
     * Subscribes {@code kind}'s wildcard filter for the whole site on {@code via} and routes what arrives.
     * Call once per kind, before the units subscribe through a view.
     *
     * @param kind a kind whose topic holds a unit id (command, field reading, field reference, …)
     * @throws IllegalArgumentException if the kind holds no unit id or is routed already
     */
    public synchronized UnitTopicRouter route(TopicKind kind, MessageBus via, Qos qos) {
        if (!kind.idNames().equals(java.util.List.of("unit"))) {
            throw new IllegalArgumentException(kind + " topics do not hold a unit id alone: " + kind.idNames());
        }
        if (routes.containsKey(kind)) {
            throw new IllegalArgumentException(kind + " is routed already");
        }
        Map<String, MessageListener> byUnit = new ConcurrentHashMap<>();
        routes.put(kind, byUnit);
        via.subscribe(topics.filterAll(kind), qos, m -> deliver(kind, byUnit, m));
        return this;
    }

    private void deliver(TopicKind kind, Map<String, MessageListener> byUnit, InboundMessage m) {
        Optional<ParsedTopic> t = TopicTree.parse(m.topic());
        if (t.isEmpty() || t.get().kind() != kind || !t.get().site().equals(topics.site())) {
            notParsed.increment();
            return;
        }
        MessageListener l = byUnit.get(t.get().unit());
        if (l == null) {
            notServed.increment();
            return;
        }
        routed.increment();
        l.onMessage(m);
    }

    /**
     * @param publishVia the connection this view publishes on and passes other subscriptions to
     * @return a bus for one or more units: a subscription to a unit's own topic of a routed kind registers here
     */
    public MessageBus view(MessageBus publishVia) {
        return new View(publishVia);
    }

    /** @return the routed kind and unit the filter is the exact topic of, if any */
    private synchronized Optional<Map<String, MessageListener>> routeOf(ParsedTopic t) {
        return t.site().equals(topics.site()) ? Optional.ofNullable(routes.get(t.kind())) : Optional.empty();
    }

    /** @return messages dropped since start because no unit here has that topic's unit id */
    public long notServedCount() {
        return notServed.sum();
    }

    /** @return messages dropped since start because their topic is not a routed unit topic of this site */
    public long notParsedCount() {
        return notParsed.sum();
    }

    /** @return messages handed to a unit's listener since start */
    public long routedCount() {
        return routed.sum();
    }

    /** @return units registered for the kind, 0 when it is not routed */
    public synchronized int unitsServed(TopicKind kind) {
        Map<String, MessageListener> byUnit = routes.get(kind);
        return byUnit == null ? 0 : byUnit.size();
    }

    private final class View extends ForwardingBus {
        View(MessageBus inner) {
            super(inner);
        }

        @Override
        public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
            Objects.requireNonNull(listener, "listener");
            Optional<ParsedTopic> t = TopicTree.parse(topicFilter);
            Optional<Map<String, MessageListener>> byUnit = t.flatMap(UnitTopicRouter.this::routeOf);
            if (byUnit.isEmpty()) {
                inner.subscribe(topicFilter, qos, listener);
                return;
            }
            MessageListener before = byUnit.get().putIfAbsent(t.get().unit(), listener);
            if (before != null) {
                throw new IllegalArgumentException("unit topic " + topicFilter + " has a listener already");
            }
        }

        @Override
        public void unsubscribe(String topicFilter) {
            Optional<ParsedTopic> t = TopicTree.parse(topicFilter);
            Optional<Map<String, MessageListener>> byUnit = t.flatMap(UnitTopicRouter.this::routeOf);
            if (byUnit.isEmpty()) {
                inner.unsubscribe(topicFilter);
            } else {
                byUnit.get().remove(t.get().unit());
            }
        }

        @Override
        public void close() {
            // the connection is shared: its owner closes it
        }
    }
}
