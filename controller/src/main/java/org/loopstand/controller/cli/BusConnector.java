package org.loopstand.controller.cli;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.WallClock;

/** Opens the controller's MQTT link with its last will (the retained offline status). */
final class BusConnector {
    private BusConnector() {
    }

    /** Starts the link; it keeps reconnecting in the background (the interlock suspends meanwhile). */
    static MessageBus connect(String brokerUrl, String clientId, OutboundMessage lastWill) throws InterruptedException {
        MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(brokerUrl).clientId(clientId)
                .lastWill(lastWill.topic(), lastWill.payload(), lastWill.qos(), lastWill.retained()).build(),
                WallClock.INSTANCE).start();
        if (!link.awaitConnected(5_000)) {
            System.err.println("control: not connected to " + brokerUrl + " yet; regulation stays suspended until it is");
        }
        return link;
    }
}
