package org.loopstand.brokernode;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.testing.FreePort;
import org.loopstand.protocol.security.broker.TestPki;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.WallClock;

/** One node on loopback (its two peers absent: it serves its own clients and keeps trying them). */
class BrokerNodeTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");

    @TempDir
    Path dir;

    private BrokerNodeSettings settings(Path users) {
        return new BrokerNodeSettings("n1", "127.0.0.1", FreePort.find(), FreePort.find(),
                List.of("127.0.0.1:" + FreePort.find(), "127.0.0.1:" + FreePort.find()), CONFIG, users, null, null, null);
    }

    private static MqttLink link(String uri, String clientId, String user, String password) {
        MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(uri).clientId(clientId).connectTimeoutMs(2000)
                .reconnectBackoff(100, 500, 0.2);
        if (user != null) {
            b.credentials(user, password.toCharArray());
        }
        return new MqttLink(b.build(), WallClock.INSTANCE);
    }

    @Test
    void shouldCarryMqtt5QoS1BetweenTwoClientsOfOneNode() throws Exception {
        BrokerNodeSettings s = settings(null);
        try (BrokerNode node = BrokerNode.start(s, dir);
             MqttLink sub = link(s.mqttUri(), "node-sub", null, null);
             MqttLink pub = link(s.mqttUri(), "node-pub", null, null)) {
            Inbox inbox = new Inbox();
            sub.subscribe("loopstand/v1/s/unit/+/command", Qos.AT_LEAST_ONCE, inbox);
            sub.start();
            pub.start();
            assertThat(sub.awaitConnected(10_000) && pub.awaitConnected(10_000)).isTrue();
            pub.publish(OutboundMessage.of("loopstand/v1/s/unit/u1/command", "c1".getBytes(UTF_8),
                    Qos.AT_LEAST_ONCE)).get();
            await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 1);
            assertThat(inbox.payloads()).containsExactly("c1");
            assertThat(inbox.messages().get(0).topic()).isEqualTo("loopstand/v1/s/unit/u1/command");
            Path filled = dir.resolve("broker-n1.xml");
            assertThat(PosixFilePermissions.toString(Files.getPosixFilePermissions(filled))).isEqualTo("rw-------");
        }
    }

    @Test
    void shouldLetInOnlyTheUsersOfItsUsersFile() throws Exception {
        Path users = Files.writeString(dir.resolve("users.properties"), "plant-h1 = right-password-0123456789\n");
        BrokerNodeSettings s = settings(users);
        try (BrokerNode node = BrokerNode.start(s, dir);
             MqttLink good = link(s.mqttUri(), "good", "plant-h1", "right-password-0123456789");
             MqttLink bad = link(s.mqttUri(), "bad", "plant-h1", "wrong-password-0123456789");
             MqttLink anonymous = link(s.mqttUri(), "anon", null, null)) {
            good.start();
            bad.start();
            anonymous.start();
            assertThat(good.awaitConnected(10_000)).isTrue();
            assertThat(bad.awaitConnected(1_500)).isFalse();
            assertThat(anonymous.isConnected()).isFalse();
        }
    }

    @Test
    void shouldServeMqttOverTlsFromTheGivenKeyStore() throws Exception {
        TestPki pki = TestPki.newCa("broker-node-test-ca");
        Path store = dir.resolve("n1.p12");
        TestPki.writeKeyStore(pki.issueServer("n1"), store, "store-pass-0123".toCharArray());
        Path storePassword = Files.writeString(dir.resolve("store-pass"), "store-pass-0123\n");
        BrokerNodeSettings plain = settings(null);
        BrokerNodeSettings s = new BrokerNodeSettings("n1", "127.0.0.1", plain.mqttPort(), plain.clusterPort(),
                plain.peers(), CONFIG, null, null, store, storePassword);
        try (BrokerNode node = BrokerNode.start(s, dir);
             MqttLink tls = new MqttLink(MqttLinkConfig.builder().serverUri(s.mqttUri()).clientId("tls")
                     .sslSocketFactory(TestPki.socketFactory(pki.ca().certificate(), null)).connectTimeoutMs(3000)
                     .build(), WallClock.INSTANCE);
             MqttLink clear = link("tcp://127.0.0.1:" + s.mqttPort(), "clear", null, null)) {
            assertThat(s.mqttUri()).startsWith("ssl://");
            tls.start();
            clear.start();
            assertThat(tls.awaitConnected(10_000)).isTrue();
            assertThat(tls.socketForTest()).isInstanceOf(javax.net.ssl.SSLSocket.class);
            assertThat(clear.awaitConnected(1_500)).as("plain MQTT on the TLS listener").isFalse();
        }
    }
}
