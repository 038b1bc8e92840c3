package org.loopstand.protocol.security.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The shipped TLS listener on a real Mosquitto with a CA generated at run time. */
class BrokerTlsMosquittoTest {
    private static final String USER = "unit-G1";

    @TempDir
    static Path dir;
    private static SecureMosquitto broker;

    @BeforeAll
    static void startBroker() throws Exception {
        broker = SecureMosquitto.start(BrokerAclMosquittoTest.MODEL, dir);
    }

    @AfterAll
    static void stopBroker() throws Exception {
        if (broker != null) {
            broker.close();
        }
    }

    @Test
    void shouldConnectWithTheGeneratedCaAndAClientCertificateItIssued() throws Exception {
        try (ProbeClient c = ProbeClient.connect(broker.sslUri(), USER, SecureMosquitto.passwordOf(USER),
                broker.trustedClientFactory(USER))) {
            assertThat(c.subscribe("loopstand/v1/rig1/unit/G1/command")).isLessThan(0x80);
        }
    }

    @Test
    void shouldRefuseAClientCertificateFromAnotherCa() throws Exception {
        TestPki rogue = TestPki.newCa("rogue-ca");
        var sockets = TestPki.socketFactory(broker.pki().ca().certificate(), rogue.issueClient(USER));
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), USER, SecureMosquitto.passwordOf(USER), sockets))
                .isInstanceOf(MqttException.class);
    }

    @Test
    void shouldRefuseAClientWithoutCertificate() throws Exception {
        var sockets = TestPki.socketFactory(broker.pki().ca().certificate(), null);
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), USER, SecureMosquitto.passwordOf(USER), sockets))
                .isInstanceOf(MqttException.class);
    }

    @Test
    void shouldRefuseABrokerCertificateTheClientDoesNotTrust() throws Exception {
        TestPki other = TestPki.newCa("other-ca");
        var sockets = TestPki.socketFactory(other.ca().certificate(), broker.pki().issueClient(USER));
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), USER, SecureMosquitto.passwordOf(USER), sockets))
                .isInstanceOf(MqttException.class);
    }

    @Test
    void shouldRefusePlainTcpToTheTlsPort() {
        assertThatThrownBy(() -> ProbeClient.connect("tcp://127.0.0.1:" + broker.port(), USER,
                SecureMosquitto.passwordOf(USER), null)).isInstanceOf(MqttException.class);
    }

    @Test
    void shouldNotBeListeningOnAnyPlainPortOfItsOwn() throws Exception {
        // The rendered config has exactly one listener, the TLS one.
        String conf = java.nio.file.Files.readString(dir.resolve("mosquitto.conf"));
        assertThat(conf.lines().filter(l -> l.startsWith("listener "))).containsExactly(
                "listener " + broker.port() + " 127.0.0.1");
        assertThat(conf).contains("require_certificate true").contains("allow_anonymous false");
    }
}
