package org.loopstand.brokernode.counters;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Properties;
import java.io.Reader;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.brokernode.BrokerNode;
import org.loopstand.brokernode.BrokerNodeSettings;
import org.loopstand.protocol.testing.FreePort;

/** A node's own counters: what its clients sent, what its subscription queues delivered and expired. */
class NodeCountersTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");
    private static final String COMMAND = "loopstand/v1/s/unit/a01-u0001/command";

    @TempDir
    Path dir;

    @Test
    void shouldTakeTheFamilyAndUnitFromTheTopicOrAddress() {
        assertThat(NodeCounters.family("loopstand.v1.s.unit.a01-u0001.telemetry")).isEqualTo("telemetry");
        assertThat(NodeCounters.family("loopstand/v1/s/field/unit/*/reading")).isEqualTo("reading");
        // Artemis's own notification addresses: no '=' may reach a key=value line
        assertThat(NodeCounters.family("activemq.notifications.ActiveMQServerImpl_name=n3")).isEqualTo("ActiveMQServerImpl_name_n3");
        assertThat(NodeCounters.family("a.x=y z\u00e9#+*-_")).isEqualTo("x_y_z_#+*-_");
        assertThat(NodeCounters.family("loopstand.v1.")).isEqualTo("-");
        assertThat(NodeCounters.destination("bench-40-unithost1-0.loopstand.v1.bench-40.unit.*.command"))
                .isEqualTo("bench-40-unithost1-0");
        assertThat(NodeCounters.destination("$.artemis.internal.sf.loopstand-cluster.6f1c-aa"))
                .isEqualTo("bridge-6f1c-aa");
    }

    @Test
    void shouldCountWhatClientsSentWhatWasDeliveredAndTheCommandThatExpiredInItsQueue() throws Exception {
        BrokerNodeSettings s = new BrokerNodeSettings("n1", "127.0.0.1", FreePort.find(), FreePort.find(),
                List.of("127.0.0.1:" + FreePort.find(), "127.0.0.1:" + FreePort.find()), CONFIG, null, null, null, null);
        try (BrokerNode node = BrokerNode.start(s, dir)) {
            MqttClient unit = client(s, "unit-a01-u0001");
            MqttConnectionOptions keep = new MqttConnectionOptions();
            keep.setCleanStart(false);
            keep.setSessionExpiryInterval(60L);
            unit.connect(keep);
            unit.subscribe(COMMAND, 1);
            unit.disconnect();
            MqttClient controller = client(s, "controller");
            controller.connect();
            // one command valid 1 s (the shortest MQTT expiry) that sits in the absent unit's queue past it
            MqttMessage expiring = new MqttMessage("c1".getBytes(UTF_8), 1, false, null);
            MqttProperties p = new MqttProperties();
            p.setMessageExpiryInterval(1L);
            expiring.setProperties(p);
            controller.publish(COMMAND, expiring);
            // and one with no expiry, delivered when the unit is back
            controller.publish(COMMAND, new MqttMessage("c2".getBytes(UTF_8), 1, false, null));
            Thread.sleep(2_100);
            java.util.List<String> got = new java.util.concurrent.CopyOnWriteArrayList<>();
            unit.setCallback(new PayloadCollector(got));
            unit.connect(keep);
            await().atMost(Duration.ofSeconds(10)).until(() -> got.size() == 1);
            Path file = dir.resolve("counters.properties");
            await().atMost(Duration.ofSeconds(10)).untilAsserted(() -> {
                node.writeCounters(file);
                Map<String, String> c = load(file);
                assertThat(c.get("count.in.client.command")).isEqualTo("2");
                assertThat(c.get("count.expired.subscription.command")).isEqualTo("1");
                assertThat(c.get("count.expiredCommand.unit-a01-u0001.a01-u0001")).isEqualTo("1");
                assertThat(c.get("queue.subscription.command.added")).isEqualTo("2");
                assertThat(c.get("queue.subscription.command.expired")).isEqualTo("1");
                // delivered and acknowledged: c2 only (Artemis counts an expired message as expired, not acknowledged)
                assertThat(c.get("queue.subscription.command.acked")).isEqualTo("1");
                assertThat(c.get("nodeId")).isEqualTo(node.nodeId());
            });
            assertThat(got).containsExactly("c2");
            unit.disconnect();
            controller.disconnect();
            unit.close();
            controller.close();
        }
    }

    private static MqttClient client(BrokerNodeSettings s, String id) throws Exception {
        return new MqttClient(s.mqttUri(), id, new MemoryPersistence());
    }

    private static Map<String, String> load(Path f) throws Exception {
        Properties p = new Properties();
        try (Reader r = Files.newBufferedReader(f, UTF_8)) {
            p.load(r);
        }
        Map<String, String> m = new java.util.TreeMap<>();
        p.stringPropertyNames().forEach(k -> m.put(k, p.getProperty(k)));
        return m;
    }

    private record PayloadCollector(List<String> got) implements org.eclipse.paho.mqttv5.client.MqttCallback {
        @Override
        public void messageArrived(String topic, MqttMessage message) {
            got.add(new String(message.getPayload(), UTF_8));
        }

        @Override
        public void disconnected(org.eclipse.paho.mqttv5.client.MqttDisconnectResponse r) {
        }

        @Override
        public void mqttErrorOccurred(org.eclipse.paho.mqttv5.common.MqttException e) {
        }

        @Override
        public void deliveryComplete(org.eclipse.paho.mqttv5.client.IMqttToken token) {
        }

        @Override
        public void connectComplete(boolean reconnect, String serverURI) {
        }

        @Override
        public void authPacketArrived(int reasonCode, MqttProperties properties) {
        }
    }
}
