package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class BrokerEndpointsTest {
    @Test
    void shouldKeepTheListOrderAndWrapRoundAfterTheLastNode() {
        BrokerEndpoints e = BrokerEndpoints.parse(" tcp://10.9.0.1:1883 , tcp://10.9.0.2:1883,tcp://10.9.0.3:1883");
        assertThat(e.uris()).containsExactly("tcp://10.9.0.1:1883", "tcp://10.9.0.2:1883", "tcp://10.9.0.3:1883");
        assertThat(e.first()).isEqualTo("tcp://10.9.0.1:1883");
        List<Integer> order = new ArrayList<>();
        int i = 0;
        for (int n = 0; n < 5; n++) {
            order.add(i);
            i = e.next(i);
        }
        assertThat(order).containsExactly(0, 1, 2, 0, 1);
        assertThat(e.hosts()).containsExactly("10.9.0.1", "10.9.0.2", "10.9.0.3");
        assertThat(e.toString()).isEqualTo("tcp://10.9.0.1:1883,tcp://10.9.0.2:1883,tcp://10.9.0.3:1883");
    }

    @Test
    void shouldNameEveryBadEntryOfTheList() {
        assertThatThrownBy(() -> BrokerEndpoints.parse("tcp://a:1883,,mqtt://b:1883,tcp://c,tcp://a:1883"))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("broker #2 is empty")
                .hasMessageContaining("broker #3 serverUri must start with tcp:// or ssl://, got 'mqtt://b:1883'")
                .hasMessageContaining("broker #4 serverUri needs a host and a port")
                .hasMessageContaining("broker #5 'tcp://a:1883' is listed twice");
        assertThatThrownBy(() -> BrokerEndpoints.parse("ssl://a:8883,tcp://b:1883"))
                .hasMessageContaining("mixes tcp:// and ssl://");
    }

    @Test
    void shouldAcceptAListInTheLinkConfigAndNameItsProblems() {
        MqttLinkConfig c = MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:1883,tcp://127.0.0.1:1884")
                .clientId("x").build();
        assertThat(c.endpoints().size()).isEqualTo(2);
        assertThat(c.serverUri()).isEqualTo("tcp://127.0.0.1:1883,tcp://127.0.0.1:1884");
        assertThatThrownBy(() -> MqttLinkConfig.builder().serverUri("tcp://127.0.0.1:1883,udp://h:1").clientId("x")
                .build()).hasMessageContaining("invalid MQTT link configuration")
                .hasMessageContaining("broker #2 serverUri must start with tcp:// or ssl://");
    }
}
