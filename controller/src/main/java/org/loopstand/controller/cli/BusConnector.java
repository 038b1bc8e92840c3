package org.loopstand.controller.cli;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.time.WallClock;

/** Opens the controller's MQTT link with its last will (the retained offline status). */
final class BusConnector {
    private BusConnector() {
    }

    /** Starts the link; it keeps reconnecting in the background (the interlock suspends meanwhile). */
    static MessageBus connect(String brokerUrl, String clientId, OutboundMessage lastWill) throws InterruptedException {
        return connect(brokerUrl, clientId, lastWill, LinkSecurity.insecureLoopback());
    }

    /** As above, logging in as {@code --username} (or the client id) with the security in force. */
    static MessageBus connect(String brokerUrl, String clientId, OutboundMessage lastWill, LinkSecurity security)
            throws InterruptedException {
        MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(brokerUrl).clientId(clientId)
                .lastWill(lastWill.topic(), lastWill.payload(), lastWill.qos(), lastWill.retained());
        String identity = security.username().orElse(clientId);
        security.applyTo(b, security.hasPasswordFor(identity) ? identity : null);
        MqttLink link = new MqttLink(b.build(), WallClock.INSTANCE).start();
        if (!link.awaitConnected(5_000)) {
            System.err.println("control: not connected to " + brokerUrl + " yet; regulation stays suspended until it is");
        }
        return link;
    }
}
