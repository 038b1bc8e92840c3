package org.loopstand.plant.cli;

import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.Clock;

/** Link factory over real MQTT connections to one broker. */
final class MqttLinks {
    private MqttLinks() {
    }

    static LinkFactory to(String serverUri, Clock clock) {
        return (clientId, will) -> {
            MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(serverUri).clientId(clientId);
            if (will != null) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            return new MqttLink(b.build(), clock).start();
        };
    }
}
