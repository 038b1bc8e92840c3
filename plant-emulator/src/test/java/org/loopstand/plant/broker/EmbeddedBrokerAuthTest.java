package org.loopstand.plant.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.awaitility.Awaitility.await;

import java.time.Duration;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.security.broker.ProbeClient;
import org.loopstand.protocol.security.broker.SecureMosquitto;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The embedded broker with its auth extension refuses what the generated Mosquitto ACL refuses (the
 * same cases as BrokerAclMosquittoTest): cross-unit commands, foreign telemetry/acks/meters,
 * controller status from a unit, fault orders from anyone but the fault tool; no reading of another
 * unit's commands; wrong password, unknown user and anonymous clients cannot connect.
 */
class EmbeddedBrokerAuthTest {
    private static final TopicTree T = TopicTree.forSite("rig1");
    private static final BrokerAccessModel MODEL = BrokerAccessModel.forSite("rig1").controller("controller-1")
            .unit("G1").unit("G2").area("A1").area("A2").build();
    private static final AtomicInteger PAYLOADS = new AtomicInteger();
    private static EmbeddedBroker broker;
    private static BrokerAuthExtension auth;

    @BeforeAll
    static void startBroker() {
        Map<String, char[]> users = new LinkedHashMap<>();
        MODEL.identities().forEach(id -> users.put(id.username(), SecureMosquitto.passwordOf(id.username()).toCharArray()));
        auth = new BrokerAuthExtension(MODEL, users);
        broker = new EmbeddedBroker("127.0.0.1", 0).withAuth(auth).start(Duration.ofSeconds(30));
    }

    @AfterAll
    static void stopBroker() {
        if (broker != null) {
            broker.close();
        }
    }

    private static ProbeClient as(String username) throws Exception {
        return ProbeClient.connect(broker.serverUri(), username, SecureMosquitto.passwordOf(username), null);
    }

    @ParameterizedTest(name = "{0} may not publish {1}")
    @MethodSource("org.loopstand.protocol.security.broker.ForbiddenPublishes#cases")
    void shouldDropAPublishOutsideTheIdentitysPermissions(String publisher, String topic, String reader,
            String allowedWriter) throws Exception {
        try (ProbeClient observer = as(reader); ProbeClient intruder = as(publisher); ProbeClient owner = as(allowedWriter)) {
            assertThat(observer.subscribe(topic)).as("observer may read").isLessThan(0x80);
            String forged = "forged-" + PAYLOADS.incrementAndGet();
            String legit = "legit-" + PAYLOADS.incrementAndGet();
            long denialsBefore = auth.publishDenials();

            int forgedCode = intruder.publishQos1(topic, forged);
            assertThat(owner.publishQos1(topic, legit)).isLessThan(0x80);

            await().atMost(Duration.ofSeconds(10)).until(() -> observer.hasReceived(legit));
            assertThat(observer.hasReceived(forged)).as("forged message delivered").isFalse();
            // MQTT 5 PUBACK reason code 0x87 = Not authorized (MQTT 5.0 spec, 3.4.2.1, from memory)
            assertThat(forgedCode).as("PUBACK reason code of the refused publish").isEqualTo(0x87);
            assertThat(auth.publishDenials()).isEqualTo(denialsBefore + 1);
        }
    }

    @Test
    void shouldRefuseAUnitSubscribingToAnotherUnitsCommandsAndDeliverItNothing() throws Exception {
        try (ProbeClient g1 = as("unit-G1"); ProbeClient g2 = as("unit-G2"); ProbeClient controller = as("controller-1")) {
            int wideCode = g1.subscribe(T.filterAll(TopicKind.UNIT_COMMAND));
            int otherCode = g1.subscribe(T.unitCommand("G2"));
            assertThat(g1.subscribe(T.unitCommand("G1"))).isLessThan(0x80);
            assertThat(g2.subscribe(T.unitCommand("G2"))).isLessThan(0x80);

            controller.publishQos1(T.unitCommand("G2"), "for-G2");
            controller.publishQos1(T.unitCommand("G1"), "for-G1");

            await().atMost(Duration.ofSeconds(10)).until(() -> g1.hasReceived("for-G1") && g2.hasReceived("for-G2"));
            assertThat(g1.received()).extracting(ProbeClient.Received::payload).containsOnly("for-G1");
            // unlike Mosquitto 2.0, the extension refuses such subscriptions outright: SUBACK 0x87
            assertThat(wideCode).isEqualTo(0x87);
            assertThat(otherCode).isEqualTo(0x87);
        }
    }

    @Test
    void shouldRefuseWrongPasswordUnknownUserAndAnonymous() {
        long before = auth.authFailures();
        // MQTT 5 CONNACK 0x86 = Bad User Name or Password (MQTT 5.0 spec, 3.2.2.2, from memory)
        assertThatThrownBy(() -> ProbeClient.connect(broker.serverUri(), "unit-G1", "wrong-password-xxxxx", null))
                .isInstanceOf(MqttException.class)
                .satisfies(e -> assertThat(((MqttException) e).getReasonCode()).isEqualTo(0x86));
        assertThatThrownBy(() -> ProbeClient.connect(broker.serverUri(), "unit-G9", "test-password-of-unit-G9", null))
                .isInstanceOf(MqttException.class);
        assertThatThrownBy(() -> ProbeClient.connect(broker.serverUri(), null, null, null))
                .isInstanceOf(MqttException.class);
        assertThat(auth.authFailures()).isEqualTo(before + 3);
    }
}
