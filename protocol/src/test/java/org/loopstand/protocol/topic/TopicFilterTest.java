package org.loopstand.protocol.topic;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Cases from OASIS MQTT Version 5.0, section 4.7 (Topic Names and Topic Filters), non-normative
 * examples of 4.7.1.2, 4.7.1.3 and 4.7.2 and shared subscriptions of 4.8.2 — from memory.
 */
class TopicFilterTest {

    @ParameterizedTest(name = "{0} vs {1} -> {2}")
    @CsvSource({
            // 4.7.1.2 multi-level wildcard: "sport/tennis/player1/#" matches these three (from memory)
            "sport/tennis/player1/#, sport/tennis/player1, true",
            "sport/tennis/player1/#, sport/tennis/player1/ranking, true",
            "sport/tennis/player1/#, sport/tennis/player1/score/wimbledon, true",
            // 4.7.1.2: "sport/#" also matches the singular "sport" (# includes the parent level)
            "sport/#, sport, true",
            "#, sport/tennis, true",
            // 4.7.1.3 single-level wildcard: "sport/tennis/+" matches "sport/tennis/player1" and
            // "sport/tennis/player2" but not "sport/tennis/player1/ranking"; "sport/+" does not match
            // "sport" but does match "sport/" (from memory)
            "sport/tennis/+, sport/tennis/player1, true",
            "sport/tennis/+, sport/tennis/player2, true",
            "sport/tennis/+, sport/tennis/player1/ranking, false",
            "sport/+, sport, false",
            "sport/+, sport/, true",
            // 4.7.1.3: "+/+" and "/+" match "/finance"; "+" does not (from memory)
            "+/+, /finance, true",
            "/+, /finance, true",
            "+, /finance, false",
            "+/tennis/#, sport/tennis/player1, true",
            // 4.7.2 topics beginning with $: not matched by filters starting with a wildcard (from memory)
            "#, $SYS/broker/clients, false",
            "+/monitor/Clients, $SYS/monitor/Clients, false",
            "$SYS/#, $SYS/broker/clients, true",
            "$SYS/monitor/+, $SYS/monitor/Clients, true",
            // 4.7.3 topic matching is case sensitive and level-exact (from memory)
            "ACCOUNTS, Accounts, false",
            "sport/tennis, sport/tennis/, false",
            // 4.8.2 shared subscriptions: $share/{ShareName}/{filter} matches like its filter (from memory)
            "$share/consumer1/sport/tennis/+, sport/tennis/player1, true",
            "$share/consumer1/sport/tennis/+, sport/badminton/player1, false",
            "$share/g/#, loopstand/v1/s/clock, true"})
    void shouldMatchLikeTheMqtt5Specification(String filter, String topic, boolean expected) {
        assertThat(TopicFilter.matches(filter, topic)).isEqualTo(expected);
    }

    // 4.7.1.2 / 4.7.1.3: "sport/tennis#", "sport/tennis/#/ranking" and "sport+" are not valid
    // filters (from memory); 4.8.2: a ShareName must be present and free of wildcards.
    @ParameterizedTest
    @ValueSource(strings = {"sport/tennis#", "sport/tennis/#/ranking", "sport+", "", "$share/sport", "$share//x",
            "$share/g+/x", "$share/g/"})
    void shouldRejectInvalidFilters(String filter) {
        assertThatThrownBy(() -> TopicFilter.matches(filter, "sport/tennis")).isInstanceOf(IllegalArgumentException.class);
    }

    // 4.7: wildcards are not allowed in topic names (from memory).
    @ParameterizedTest
    @ValueSource(strings = {"", "sport/+", "sport/#"})
    void shouldRejectInvalidTopicNames(String topic) {
        assertThatThrownBy(() -> TopicFilter.matches("#", topic)).isInstanceOf(IllegalArgumentException.class);
    }
}
