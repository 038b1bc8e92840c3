package org.loopstand.protocol.security.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.awaitility.Awaitility.await;

import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.atomic.AtomicInteger;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The generated ACL and password file enforced by a real Mosquitto 2 (TLS listener, client
 * certificates from a throw-away CA). Reason codes: MQTT 5.0 section 2.4 (0x80 and above are
 * failures, 0x87 Not authorized, 0x86 Bad user name or password); from memory.
 */
class BrokerAclMosquittoTest {
    private static final TopicTree T = TopicTree.forSite("rig1");
    static final BrokerAccessModel MODEL = BrokerAccessModel.forSite("rig1").controller("controller-1")
            .unit("G1").unit("G2").area("A1").area("A2").build();
    private static final AtomicInteger PAYLOADS = new AtomicInteger();

    @TempDir
    static Path dir;
    private static SecureMosquitto broker;

    @BeforeAll
    static void startBroker() throws Exception {
        broker = SecureMosquitto.start(MODEL, dir);
    }

    @AfterAll
    static void stopBroker() throws Exception {
        if (broker != null) {
            broker.close();
        }
    }

    private static ProbeClient as(String username) throws Exception {
        return ProbeClient.connect(broker.sslUri(), username, SecureMosquitto.passwordOf(username),
                broker.trustedClientFactory(username));
    }

    @ParameterizedTest(name = "{0} may not publish {1}")
    @MethodSource("org.loopstand.protocol.security.broker.ForbiddenPublishes#cases")
    void shouldDropAPublishOutsideTheIdentitysPermissions(String publisher, String topic, String reader,
            String allowedWriter) throws Exception {
        try (ProbeClient observer = as(reader); ProbeClient intruder = as(publisher); ProbeClient owner = as(allowedWriter)) {
            assertThat(observer.subscribe(topic)).as("observer may read").isLessThan(0x80);
            String forged = "forged-" + PAYLOADS.incrementAndGet();
            String legit = "legit-" + PAYLOADS.incrementAndGet();

            int forgedCode = intruder.publishQos1(topic, forged);
            assertThat(owner.publishQos1(topic, legit)).isLessThan(0x80);

            // The broker queues to the observer in the order it processed the publishes, and the
            // forged one was processed before its PUBACK: once the legit one is in, the forged one
            // would be too.
            await().atMost(Duration.ofSeconds(10)).until(() -> observer.hasReceived(legit));
            assertThat(observer.hasReceived(forged)).as("forged message delivered").isFalse();
            assertThat(forgedCode).as("PUBACK reason code of the refused publish").isEqualTo(0x87);
            await().atMost(Duration.ofSeconds(5)).untilAsserted(() -> assertThat(MosquittoLogEvents.parse(broker.logText()))
                    .anySatisfy(e -> {
                        assertThat(e.kind()).isEqualTo(MosquittoLogEvents.PUBLISH_DENIED);
                        assertThat(e.fields()).containsEntry("topic", topic);
                    }));
        }
    }

    @Test
    void shouldDeliverNothingToAUnitSubscribingToAnotherUnitsCommands() throws Exception {
        try (ProbeClient g1 = as("unit-G1"); ProbeClient g2 = as("unit-G2"); ProbeClient controller = as("controller-1")) {
            int wideCode = g1.subscribe(T.filterAll(org.loopstand.protocol.topic.TopicKind.UNIT_COMMAND));
            int otherCode = g1.subscribe(T.unitCommand("G2"));
            assertThat(g1.subscribe(T.unitCommand("G1"))).isLessThan(0x80);
            assertThat(g2.subscribe(T.unitCommand("G2"))).isLessThan(0x80);

            controller.publishQos1(T.unitCommand("G2"), "for-G2");
            controller.publishQos1(T.unitCommand("G1"), "for-G1");

            await().atMost(Duration.ofSeconds(10)).until(() -> g1.hasReceived("for-G1") && g2.hasReceived("for-G2"));
            // Overlapping subscriptions may deliver G1's own command twice (MQTT 5 allows it); G2's never.
            assertThat(g1.received()).extracting(ProbeClient.Received::payload).containsOnly("for-G1");
            // Mosquitto 2.0 grants such subscriptions and filters at delivery (recorded, not relied on).
            assertThat(wideCode).isBetween(0, 0xff);
            assertThat(otherCode).isBetween(0, 0xff);
        }
    }

    @Test
    void shouldRefuseWrongPasswordUnknownUserAndAnonymousAndLogIt() throws Exception {
        var sockets = broker.trustedClientFactory("someone");
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), "unit-G1", "wrong-password-xxxxx", sockets))
                .isInstanceOf(MqttException.class)
                .satisfies(e -> assertThat(((MqttException) e).getReasonCode()).isIn(0x86, 0x87));
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), "unit-G9", "test-password-of-unit-G9", sockets))
                .isInstanceOf(MqttException.class);
        assertThatThrownBy(() -> ProbeClient.connect(broker.sslUri(), null, null, sockets))
                .isInstanceOf(MqttException.class);
        // The password hash written in Java ($7$ PBKDF2) is accepted by the real broker.
        try (ProbeClient ok = as("unit-G1")) {
            assertThat(ok).isNotNull();
        }
        await().atMost(Duration.ofSeconds(5)).untilAsserted(() ->
                assertThat(MosquittoLogEvents.parse(broker.logText()))
                        .anySatisfy(e -> assertThat(e.kind()).isEqualTo(MosquittoLogEvents.AUTH_FAILED)));
    }
}
