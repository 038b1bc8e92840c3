package org.loopstand.plant.broker;

import org.loopstand.protocol.bus.mqtt.MqttLinkContract;

/** The MQTT contract against the embedded HiveMQ CE broker (shared per test JVM). */
class EmbeddedBrokerMqttLinkTest extends MqttLinkContract {
    @Override
    protected String serverUri() {
        return SharedEmbeddedBroker.serverUri();
    }
}
