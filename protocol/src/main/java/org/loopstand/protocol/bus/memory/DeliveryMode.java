package org.loopstand.protocol.bus.memory;

/** How an {@link InMemoryBroker} hands messages to subscribers. */
public enum DeliveryMode {
    /** At once, on the publisher's thread (a publish inside a listener is delivered depth-first). */
    DIRECT,
    /** Queued until {@link InMemoryBroker#deliverPending()}: deterministic, for study mode. */
    LOCKSTEP
}
