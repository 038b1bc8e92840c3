package org.loopstand.protocol.bus.mqtt;

import java.util.function.Consumer;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.time.Clock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Paho's callbacks for one {@link MqttLink}: each returns at once. Received messages go to the link's
 * {@link ReceiveQueue}; a lost connection is handed to the link ({@code onLost}), which deals with it
 * on its own reconnect thread.
 */
final class PahoCallbacks implements MqttCallback {
    private static final Logger LOG = LoggerFactory.getLogger(PahoCallbacks.class);

    private final String clientId;
    private final ReceiveQueue receiveQueue;
    private final Clock clock;
    private final Consumer<Throwable> onLost;

    /** @param onLost must not block (it hands the cause to another thread) */
    PahoCallbacks(String clientId, ReceiveQueue receiveQueue, Clock clock, Consumer<Throwable> onLost) {
        this.clientId = clientId;
        this.receiveQueue = receiveQueue;
        this.clock = clock;
        this.onLost = onLost;
    }

    @Override
    public void disconnected(MqttDisconnectResponse response) {
        onLost.accept(response.getException());
    }

    @Override
    public void mqttErrorOccurred(MqttException exception) {
        LOG.warn("{}: MQTT error: {}", clientId, exception.getMessage());
    }

    @Override
    public void messageArrived(String topic, MqttMessage message) {
        receiveQueue.offer(new InboundMessage(topic, message.getPayload(),
                message.getQos() >= 1 ? Qos.AT_LEAST_ONCE : Qos.AT_MOST_ONCE, message.isRetained(),
                message.isDuplicate(), clock.monotonicNanos()));
    }

    @Override
    public void deliveryComplete(IMqttToken token) {
        // completion is handled by the publish's own action listener
    }

    @Override
    public void connectComplete(boolean reconnect, String serverUri) {
        // the link's own thread reports connections, after resubscribing
    }

    @Override
    public void authPacketArrived(int reasonCode, MqttProperties properties) {
        // no enhanced authentication
    }
}
