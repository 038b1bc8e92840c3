package org.loopstand.protocol.bus.mqtt;

import org.loopstand.protocol.testing.Mosquitto;

/** The MQTT contract against the machine's Mosquitto on 127.0.0.1:1883 (fails loudly when it is absent). */
class SystemMosquittoMqttLinkTest extends MqttLinkContract {
    @Override
    protected String serverUri() {
        return Mosquitto.system();
    }
}
