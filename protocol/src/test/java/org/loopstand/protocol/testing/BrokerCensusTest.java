package org.loopstand.protocol.testing;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Map;

import org.junit.jupiter.api.Test;

class BrokerCensusTest {

    @Test
    void shouldSayEveryBrokerFoundInOneLine() {
        String line = BrokerCensus.line(new BrokerCensus.Findings(true, true, false));

        assertThat(line).isEqualTo("brokers: Mosquitto on 127.0.0.1:1883 found (real-broker tests use it);"
                + " embedded HiveMQ CE started by the tests on free ports; no Docker engine (Testcontainers tests skip)");
    }

    @Test
    void shouldSayHowToStartMosquittoWhenItIsMissing() {
        String line = BrokerCensus.line(new BrokerCensus.Findings(false, false, true));

        assertThat(line).isEqualTo("brokers: Mosquitto NOT found on 127.0.0.1:1883: the real-broker tests will fail;"
                + " start it with 'apt-get install mosquitto' then 'mosquitto -d -c /etc/mosquitto/mosquitto.conf'"
                + " (or .ci/run); no embedded HiveMQ CE in this module; Docker engine found (Testcontainers tests run)");
        assertThat(line).doesNotContain("\n");
    }

    @Test
    void shouldTakeDockerHostAsADockerEngine() {
        BrokerCensus.Findings f = BrokerCensus.probe(Map.of("DOCKER_HOST", "tcp://127.0.0.1:2375"));

        assertThat(f.dockerEngine()).isTrue();
    }

    @Test
    void shouldFindNoEmbeddedHiveMqOnTheProtocolClassPath() {
        // the protocol module does not depend on HiveMQ; plant-emulator does
        BrokerCensus.Findings f = BrokerCensus.probe(Map.of());

        assertThat(f.hivemqOnClassPath()).isFalse();
    }
}
