package org.loopstand.controller.cli;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;

/** Opens the controller's bus connection with its last will (the offline status). */
final class BusConnector {
    private BusConnector() {
    }

    static MessageBus connect(String brokerUrl, String clientId, OutboundMessage lastWill) {
        // The MQTT link lands from another branch; until then the process cannot reach a broker.
        throw new IllegalStateException("the MQTT link is not in this build yet; cannot connect to " + brokerUrl);
    }
}
