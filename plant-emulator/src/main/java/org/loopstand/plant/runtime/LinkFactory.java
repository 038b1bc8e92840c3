package org.loopstand.plant.runtime;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;

/**
 * Opens one bus connection. The MQTT form builds an {@code MqttLink} with the will in its config; the
 * in-memory form calls {@code InMemoryBroker.connect(clientId, lastWill)}.
 */
@FunctionalInterface
public interface LinkFactory {
    /**
     * @param clientId MQTT client id, unique on the broker
     * @param lastWill message the broker publishes when the connection is lost, or null
     * @return a started connection (it may still be connecting; it reconnects on its own)
     */
    MessageBus connect(String clientId, OutboundMessage lastWill);
}
