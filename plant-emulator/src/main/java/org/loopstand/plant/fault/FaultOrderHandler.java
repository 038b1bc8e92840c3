package org.loopstand.plant.fault;

import java.util.Optional;
import java.util.Queue;
import java.util.concurrent.ConcurrentLinkedQueue;

import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Live faults: takes {@link FaultOrder}s from the faults topic and starts or stops them in the
 * {@link FaultEngine}. Messages may arrive on any thread ({@link #onMessage} only decodes and queues);
 * {@link #doWork()} applies them on the engine's thread. An order that does not decode, names an
 * unknown type, target or parameter, or contradicts an active fault is refused and the reason is told
 * to the observer (journal kind {@code fault}, action {@code refused}).
 */
public final class FaultOrderHandler implements MessageListener, Agent {
    private final FaultEngine engine;
    private final FaultLibrary library;
    private final TargetCatalog catalog;
    private final MessageCodec codec;
    private final FaultObserver observer;
    private final Clock clock;
    private final Queue<Object> inbox = new ConcurrentLinkedQueue<>();
    private final java.util.Set<String> othersTypes;

    public FaultOrderHandler(FaultEngine engine, FaultLibrary library, TargetCatalog catalog, MessageCodec codec,
            FaultObserver observer, Clock clock) {
        this(engine, library, catalog, codec, observer, clock, java.util.Set.of());
    }

    /**
     * @param othersTypes order types another handler on the same topic acts on (the plant's operator
     *                    orders such as {@code setControlMode}); they are left alone, not refused
     */
    public FaultOrderHandler(FaultEngine engine, FaultLibrary library, TargetCatalog catalog, MessageCodec codec,
            FaultObserver observer, Clock clock, java.util.Set<String> othersTypes) {
        this.othersTypes = java.util.Set.copyOf(othersTypes);
        this.engine = engine;
        this.library = library;
        this.catalog = catalog;
        this.codec = codec;
        this.observer = observer;
        this.clock = clock;
    }

    /** Subscribes this handler to the site's faults topic. */
    public void subscribe(MessageBus bus, TopicTree topics) {
        bus.subscribe(topics.faults(), Qos.AT_LEAST_ONCE, this);
    }

    @Override
    public void onMessage(InboundMessage message) {
        Decoded<FaultOrder> d = codec.decode(message.payload(), FaultOrder.class);
        if (d instanceof Decoded.Ok<FaultOrder> ok) {
            inbox.add(ok.value());
        } else if (d instanceof Decoded.Rejected<FaultOrder> bad) {
            inbox.add("fault order on " + message.topic() + " does not decode: " + bad.error());
        }
    }

    @Override
    public int doWork() {
        int n = 0;
        for (Object o = inbox.poll(); o != null; o = inbox.poll()) {
            if (o instanceof FaultOrder order) {
                handle(order);
            } else {
                observer.faultRefused(clock.epochMillis(), "?", (String) o);
            }
            n++;
        }
        return n;
    }

    @Override
    public String roleName() {
        return "fault-orders";
    }

    /**
     * Applies one order now (on the engine's thread).
     *
     * @return why it was refused, if it was (already told to the observer)
     */
    public Optional<String> handle(FaultOrder order) {
        if (othersTypes.contains(order.faultType())) {
            return Optional.empty();
        }
        if (order.action() == FaultAction.STOP) {
            return engine.stop(order.orderId(), "stopped by order");
        }
        double lengthS = order.durationS() == null ? Double.POSITIVE_INFINITY : order.durationS();
        FaultSpec.Builder b = FaultSpec.builder(library, catalog).id(order.orderId()).type(order.faultType())
                .targets(order.targets()).window(0, lengthS);
        order.parameters().forEach(b::parameter);
        var problems = b.problems();
        if (!problems.isEmpty()) {
            String why = "order " + order.orderId() + " refused: " + String.join("; ",
                    problems.stream().map(FaultSpec.Problem::message).toList());
            observer.faultRefused(clock.epochMillis(), order.orderId(), why);
            return Optional.of(why);
        }
        return engine.startNow(b.build());
    }
}
