package org.loopstand.protocol.security.broker;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import javax.net.SocketFactory;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;

/** A bare Paho v5 client for broker permission tests: records what arrives and the reason codes. */
public final class ProbeClient implements AutoCloseable {
    /** A message received, topic and payload text. */
    public record Received(String topic, String payload) {
    }

    private static final long WAIT_MS = 10_000;
    private final MqttAsyncClient client;
    private final List<Received> received = new CopyOnWriteArrayList<>();

    private ProbeClient(MqttAsyncClient client) {
        this.client = client;
    }

    /**
     * @return a connected client
     * @throws MqttException when the broker (or TLS) refuses the connection
     */
    public static ProbeClient connect(String uri, String username, String password, SocketFactory sockets)
            throws MqttException {
        MqttAsyncClient c = new MqttAsyncClient(uri, "probe-" + username + "-" + System.identityHashCode(new Object()),
                new MemoryPersistence());
        ProbeClient probe = new ProbeClient(c);
        c.setCallback(probe.callback());
        MqttConnectionOptions o = new MqttConnectionOptions();
        o.setCleanStart(true);
        o.setAutomaticReconnect(false);
        o.setConnectionTimeout(5);
        if (username != null) {
            o.setUserName(username);
        }
        if (password != null) {
            o.setPassword(password.getBytes(StandardCharsets.UTF_8));
        }
        if (sockets != null) {
            o.setSocketFactory(sockets);
        }
        try {
            c.connect(o).waitForCompletion(WAIT_MS);
        } catch (MqttException e) {
            closeQuietly(c);
            throw e;
        }
        return probe;
    }

    /** @return the SUBACK reason code (≥ 0x80 = refused) */
    public int subscribe(String filter) throws MqttException {
        IMqttToken t = client.subscribe(filter, 1);
        t.waitForCompletion(WAIT_MS);
        return t.getReasonCodes()[0];
    }

    /** @return the PUBACK reason code of a QoS 1 publish (≥ 0x80 = refused) */
    public int publishQos1(String topic, String payload) throws MqttException {
        MqttMessage m = new MqttMessage(payload.getBytes(StandardCharsets.UTF_8), 1, false, null);
        IMqttToken t = client.publish(topic, m);
        try {
            t.waitForCompletion(WAIT_MS);
        } catch (MqttException e) {
            return e.getReasonCode();
        }
        int[] codes = t.getReasonCodes();
        return codes == null || codes.length == 0 ? 0 : codes[0];
    }

    public List<Received> received() {
        return received;
    }

    public boolean hasReceived(String payload) {
        return received.stream().anyMatch(r -> r.payload().equals(payload));
    }

    private MqttCallback callback() {
        return new MqttCallback() {
            @Override
            public void disconnected(MqttDisconnectResponse response) {
            }

            @Override
            public void mqttErrorOccurred(MqttException exception) {
            }

            @Override
            public void messageArrived(String topic, MqttMessage message) {
                received.add(new Received(topic, new String(message.getPayload(), StandardCharsets.UTF_8)));
            }

            @Override
            public void deliveryComplete(IMqttToken token) {
            }

            @Override
            public void connectComplete(boolean reconnect, String serverURI) {
            }

            @Override
            public void authPacketArrived(int reasonCode, MqttProperties properties) {
            }
        };
    }

    private static void closeQuietly(MqttAsyncClient c) {
        try {
            c.close(true);
        } catch (MqttException ignored) {
            // already closed
        }
    }

    @Override
    public void close() {
        try {
            if (client.isConnected()) {
                client.disconnect(0).waitForCompletion(WAIT_MS);
            }
        } catch (MqttException ignored) {
            // the broker may already have dropped us
        }
        closeQuietly(client);
    }
}
