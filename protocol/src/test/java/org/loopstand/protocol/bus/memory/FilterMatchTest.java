package org.loopstand.protocol.bus.memory;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

class FilterMatchTest {
    // Cases from MQTT 5 §4.7.1 (wildcards) and §4.7.2 ($ topics), from memory.
    @ParameterizedTest
    @CsvSource({
            "sport/tennis/player1/#, sport/tennis/player1, true",
            "sport/tennis/player1/#, sport/tennis/player1/ranking, true",
            "sport/tennis/player1/#, sport/tennis/player1/score/wimbledon, true",
            "sport/#, sport, true",
            "#, any/topic, true",
            "sport/tennis/+, sport/tennis/player1, true",
            "sport/tennis/+, sport/tennis/player1/ranking, false",
            "sport/+, sport, false",
            "sport/+, sport/, true",
            "+/+, /finance, true",
            "/+, /finance, true",
            "+, /finance, false",
            "#, $SYS/broker, false",
            "+/monitor/Clients, $SYS/monitor/Clients, false",
            "$SYS/#, $SYS/broker, true",
            "a/b, a/b, true",
            "a/b, a/c, false",
    })
    void shouldMatchLikeMqtt(String filter, String topic, boolean expected) {
        assertThat(FilterMatch.matches(filter, topic)).isEqualTo(expected);
    }

    @Test
    void shouldRejectMalformedFilters() {
        assertThatThrownBy(() -> FilterMatch.validate("sport/tennis#")).hasMessageContaining("'#'");
        assertThatThrownBy(() -> FilterMatch.validate("sport/#/ranking")).hasMessageContaining("'#'");
        assertThatThrownBy(() -> FilterMatch.validate("sport+")).hasMessageContaining("'+'");
        assertThatThrownBy(() -> FilterMatch.validate("")).hasMessageContaining("empty");
    }
}
