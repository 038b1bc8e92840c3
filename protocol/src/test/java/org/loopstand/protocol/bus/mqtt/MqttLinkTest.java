package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import org.eclipse.paho.mqttv5.client.MqttClientException;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.BusException.Reason;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.testing.FreePort;
import org.loopstand.protocol.time.WallClock;

/** Link behaviour that needs no broker. */
class MqttLinkTest {
    @Test
    void shouldFailPublishWithNotConnectedAndCountItWhileNoBrokerAnswers() throws Exception {
        MqttLinkConfig config = MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:" + FreePort.find())
                .clientId("lonely").reconnectBackoff(200, 1_000, 0.2).build();
        try (MqttLink link = new MqttLink(config, WallClock.INSTANCE).start()) {
            CompletableFuture<Void> f = link.publish(OutboundMessage.of("rig/x", new byte[] {1}, Qos.AT_LEAST_ONCE));

            assertThatThrownBy(f::get).isInstanceOf(ExecutionException.class)
                    .cause().isInstanceOf(BusException.class)
                    .extracting(e -> ((BusException) e).reason()).isEqualTo(Reason.NOT_CONNECTED);
            assertThat(link.counters().sendFailed()).isEqualTo(1);
            assertThat(link.failures(Reason.NOT_CONNECTED)).isEqualTo(1);
            assertThat(link.isConnected()).isFalse();
        }
    }

    @Test
    void shouldFailPublishWithClosedAfterClose() throws Exception {
        MqttLinkConfig config = MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:" + FreePort.find())
                .clientId("closed").build();
        MqttLink link = new MqttLink(config, WallClock.INSTANCE);
        link.close();
        CompletableFuture<Void> f = link.publish(OutboundMessage.of("rig/x", new byte[] {1}, Qos.AT_MOST_ONCE));
        assertThatThrownBy(f::get).cause().extracting(e -> ((BusException) e).reason()).isEqualTo(Reason.CLOSED);
    }

    @Test
    void shouldTreatPahoInflightAndMessageIdExhaustionAsBackPressure() {
        assertThat(LinkPublisher.reasonOf(new MqttException(MqttClientException.REASON_CODE_MAX_INFLIGHT)))
                .isEqualTo(Reason.BACK_PRESSURE);
        assertThat(LinkPublisher.reasonOf(new MqttException(MqttClientException.REASON_CODE_NO_MESSAGE_IDS_AVAILABLE)))
                .isEqualTo(Reason.BACK_PRESSURE);
        assertThat(LinkPublisher.reasonOf(new MqttException(MqttClientException.REASON_CODE_CLIENT_NOT_CONNECTED)))
                .isEqualTo(Reason.NOT_CONNECTED);
        // 0x87 Not authorized is a PUBACK reason code (MQTT 5 §3.4.2.1, from memory).
        assertThat(LinkPublisher.reasonOf(new MqttException(0x87))).isEqualTo(Reason.REFUSED_BY_BROKER);
    }

    @Test
    void shouldRejectMalformedTopicFilter() {
        MqttLinkConfig config = MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:1").clientId("f").build();
        try (MqttLink link = new MqttLink(config, WallClock.INSTANCE)) {
            assertThatThrownBy(() -> link.subscribe("rig/#/x", Qos.AT_LEAST_ONCE, m -> { }))
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("rig/#/x");
        }
    }
}
