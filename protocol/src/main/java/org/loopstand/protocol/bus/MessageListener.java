package org.loopstand.protocol.bus;

/** Receives messages for a subscription. Called off the transport thread; must not block for long. */
@FunctionalInterface
public interface MessageListener {
    void onMessage(InboundMessage message);
}
