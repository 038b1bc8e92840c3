package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.Qos;

class MqttLinkConfigTest {
    @Test
    void shouldApplyRigDefaults() {
        MqttLinkConfig c = MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:1883").clientId("plant-1").build();
        assertThat(c.cleanStart()).isFalse();
        assertThat(c.sessionExpirySeconds()).isEqualTo(300);
        assertThat(c.keepAliveSeconds()).isEqualTo(30);
        assertThat(c.receiveQueueCapacity()).isEqualTo(10_000);
        assertThat(c.isTls()).isFalse();
        assertThat(c.lastWill()).isEmpty();
    }

    @Test
    void shouldNameEveryWrongSettingAtOnce() {
        assertThatThrownBy(() -> MqttLinkConfig.builder().serverUri("mqtt://broker:1883").clientId("")
                .keepAliveSeconds(70_000).reconnectBackoff(500, 100, 1.5).receiveQueueCapacity(0).build())
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("serverUri must start with tcp:// or ssl://")
                .hasMessageContaining("clientId is missing")
                .hasMessageContaining("keepAliveSeconds")
                .hasMessageContaining("reconnect max delay")
                .hasMessageContaining("reconnect jitter")
                .hasMessageContaining("receiveQueueCapacity");
    }

    @Test
    void shouldRejectTlsSettingsOnPlainUriAndMissingStoreFiles() {
        assertThatThrownBy(() -> MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:8883").clientId("c")
                .trustStore(Path.of("/nonexistent/ca.p12"), "pw".toCharArray()).build())
                .hasMessageContaining("TLS settings need an ssl:// serverUri")
                .hasMessageContaining("trust store /nonexistent/ca.p12 does not exist");
    }

    @Test
    void shouldRejectWildcardWillTopicAndMissingPort() {
        assertThatThrownBy(() -> MqttLinkConfig.builder().serverUri("tcp://127.0.0.1").clientId("c")
                .lastWill("rig/+/alive", new byte[0], Qos.AT_LEAST_ONCE, true).build())
                .hasMessageContaining("last will topic")
                .hasMessageContaining("needs a host and a port");
    }

    @Test
    void shouldCopyPasswordSoCallerMayWipeIt() {
        char[] pw = "secret".toCharArray();
        MqttLinkConfig c = MqttLinkConfig.builder().serverUri("ssl://127.0.0.1:8883").clientId("c")
                .credentials("plant", pw).build();
        java.util.Arrays.fill(pw, 'x');
        assertThat(c.password()).hasValueSatisfying(p -> assertThat(new String(p)).isEqualTo("secret"));
        assertThat(c.isTls()).isTrue();
    }
}
