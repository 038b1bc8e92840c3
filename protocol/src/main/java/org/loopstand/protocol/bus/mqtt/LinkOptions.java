package org.loopstand.protocol.bus.mqtt;

import java.nio.charset.StandardCharsets;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.common.MqttMessage;

/**
 * Paho connection options of one link, made once from its {@link MqttLinkConfig}; each connect attempt
 * takes a copy aimed at one broker node ({@link #forAttempt}). Paho's own automatic reconnect and its
 * own walk through several server URIs are not used: the link chooses the node ({@link FailoverCursor})
 * and bounds each attempt itself.
 */
final class LinkOptions {
    private final MqttLinkConfig config;
    private final NoDelaySockets sockets;

    LinkOptions(MqttLinkConfig config, NoDelaySockets sockets) {
        this.config = config;
        this.sockets = sockets;
    }

    /**
     * @param uri        the one node this attempt connects to
     * @param cleanStart true to discard any session (and the client's in-flight QoS 1 publishes)
     */
    MqttConnectionOptions forAttempt(String uri, boolean cleanStart) {
        MqttConnectionOptions o = new MqttConnectionOptions();
        o.setServerURIs(new String[] {uri});
        o.setAutomaticReconnect(false);
        o.setCleanStart(cleanStart);
        o.setSessionExpiryInterval(config.sessionExpirySeconds());
        o.setKeepAliveInterval(config.keepAliveSeconds());
        o.setMaximumPacketSize((long) PacketLimits.MAX_PACKET_BYTES);
        // TCP connect bound, s; the wait for the CONNACK is bounded by the link (connectTimeoutMs)
        o.setConnectionTimeout(Math.max(1, config.connectTimeoutMs() / 1000));
        config.username().ifPresent(o::setUserName);
        config.password().ifPresent(pw -> o.setPassword(new String(pw).getBytes(StandardCharsets.UTF_8)));
        o.setSocketFactory(config.isTls() ? sockets.tls(TlsSocketFactories.from(config)) : sockets.plain());
        config.lastWill().ifPresent(will -> {
            MqttMessage m = new MqttMessage(will.payload(), will.qos().level(), will.retained(), null);
            o.setWill(will.topic(), m);
        });
        return o;
    }
}
