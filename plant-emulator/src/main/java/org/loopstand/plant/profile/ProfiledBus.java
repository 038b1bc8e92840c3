package org.loopstand.plant.profile;

import java.util.concurrent.CompletableFuture;
import java.util.function.BiConsumer;

import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;

/**
 * A bus that speaks a {@link WireProfile} on the wire and the rig's own layout to the code above it:
 * publications are rewritten into the profile, subscriptions are made with the profile's topics, and
 * deliveries are rewritten back. A mapped field that cannot be read back (in the wrong form) keeps its
 * wire name, so the codec refuses the message naming it, and is told to {@code onUnreadable} with the
 * expected form.
 */
public final class ProfiledBus extends ForwardingBus {
    private final WireProfile profile;
    private final BiConsumer<String, String> onUnreadable;

    /**
     * @param onUnreadable told (wire topic, reason) for a delivery whose mapped fields could not be read back
     */
    public ProfiledBus(MessageBus inner, WireProfile profile, BiConsumer<String, String> onUnreadable) {
        super(inner);
        this.profile = profile;
        this.onUnreadable = onUnreadable;
    }

    @Override
    public CompletableFuture<Void> publish(OutboundMessage message) {
        return inner.publish(profile.toWire(message));
    }

    @Override
    public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
        inner.subscribe(profile.toWireFilter(topicFilter), qos, m -> listener.onMessage(readBack(m)));
    }

    @Override
    public void unsubscribe(String topicFilter) {
        inner.unsubscribe(profile.toWireFilter(topicFilter));
    }

    private InboundMessage readBack(InboundMessage wire) {
        java.util.List<String> problems = new java.util.ArrayList<>();
        InboundMessage rig = profile.toRig(wire, problems);
        problems.forEach(p -> onUnreadable.accept(wire.topic(), p));
        return rig;
    }
}
