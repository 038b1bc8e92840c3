package org.loopstand.plant.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.net.InetAddress;
import java.net.ServerSocket;
import java.time.Duration;
import org.junit.jupiter.api.Test;

class EmbeddedBrokerTest {
    @Test
    void shouldRefuseToStartWithClearMessageWhenPortIsTaken() throws Exception {
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getByName("127.0.0.1"))) {
            EmbeddedBroker broker = new EmbeddedBroker("127.0.0.1", taken.getLocalPort());
            assertThatThrownBy(() -> broker.start(Duration.ofSeconds(10)))
                    .isInstanceOf(IllegalStateException.class)
                    .hasMessageStartingWith("port " + taken.getLocalPort() + " on 127.0.0.1 is already in use: ");
            assertThat(broker.isRunning()).isFalse();
        }
    }

    @Test
    void shouldRejectPortOutOfRange() {
        assertThatThrownBy(() -> new EmbeddedBroker("127.0.0.1", 70_000)).hasMessageContaining("port must be in");
    }

    @Test
    void shouldReportThePickedPortOfTheSharedBroker() {
        String uri = SharedEmbeddedBroker.serverUri();
        assertThat(uri).startsWith("tcp://127.0.0.1:").doesNotEndWith(":0");
    }
}
