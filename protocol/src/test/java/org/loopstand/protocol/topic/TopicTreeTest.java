package org.loopstand.protocol.topic;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.List;
import java.util.Optional;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.message.MessageArbitraries;

class TopicTreeTest {
    private final TopicTree tree = TopicTree.forSite("demo-site");

    @Test
    void shouldBuildEveryTopicOfTheContract() {
        String root = "loopstand/v1/demo-site";
        assertThat(tree.root()).isEqualTo(root);
        assertThat(tree.areaMeter("north", "m1")).isEqualTo(root + "/area/north/meter/m1");
        assertThat(tree.unitTelemetry("u1")).isEqualTo(root + "/unit/u1/telemetry");
        assertThat(tree.unitCommand("u1")).isEqualTo(root + "/unit/u1/command");
        assertThat(tree.unitAck("u1")).isEqualTo(root + "/unit/u1/ack");
        assertThat(tree.unitLink("u1")).isEqualTo(root + "/unit/u1/link");
        assertThat(tree.areaSchedule("north")).isEqualTo(root + "/area/north/schedule");
        assertThat(tree.controllerStatus("ctl-a")).isEqualTo(root + "/controller/ctl-a/status");
        assertThat(tree.clock()).isEqualTo(root + "/clock");
        assertThat(tree.faults()).isEqualTo(root + "/faults");
        assertThat(tree.fieldReference("u1")).isEqualTo(root + "/field/unit/u1/reference");
        assertThat(tree.fieldReading("u1")).isEqualTo(root + "/field/unit/u1/reading");
    }

    @Test
    void shouldBuildSubscriptionFilters() {
        String root = "loopstand/v1/demo-site";
        assertThat(tree.filterAll(TopicKind.AREA_METER)).isEqualTo(root + "/area/+/meter/+");
        assertThat(tree.filterAll(TopicKind.UNIT_TELEMETRY)).isEqualTo(root + "/unit/+/telemetry");
        assertThat(tree.filterAll(TopicKind.CLOCK)).isEqualTo(root + "/clock");
        assertThat(tree.filterAreaMeters("north")).isEqualTo(root + "/area/north/meter/+");
        assertThat(tree.filterUnit("u1")).isEqualTo(root + "/unit/u1/+");
        assertThat(tree.filterEverything()).isEqualTo(root + "/#");
        for (TopicKind kind : TopicKind.values()) {
            String[] ids = kind.idNames().stream().map(n -> n + "1").toArray(String[]::new);
            assertThat(TopicFilter.matches(tree.filterAll(kind), tree.topic(kind, ids))).as(kind.name()).isTrue();
            assertThat(TopicFilter.matches(tree.filterEverything(), tree.topic(kind, ids))).isTrue();
        }
        assertThat(TopicFilter.matches(tree.filterAll(TopicKind.UNIT_ACK), tree.unitCommand("u1"))).isFalse();
    }

    @Test
    void shouldCarryDeliveryOfTheContract() {
        assertThat(TopicKind.AREA_METER.defaultQos()).isEqualTo(Qos.AT_MOST_ONCE);
        assertThat(TopicKind.UNIT_COMMAND.defaultQos()).isEqualTo(Qos.AT_LEAST_ONCE);
        assertThat(TopicKind.UNIT_COMMAND.retained()).isFalse();
        assertThat(TopicKind.UNIT_LINK.retained()).isTrue();
        assertThat(TopicKind.AREA_SCHEDULE.retained()).isTrue();
        assertThat(TopicKind.CONTROLLER_STATUS.retained()).isTrue();
        assertThat(TopicKind.CLOCK.retained()).isTrue();
        assertThat(TopicKind.CLOCK.defaultQos()).isEqualTo(Qos.AT_MOST_ONCE);
        assertThat(TopicKind.FIELD_READING.defaultQos()).isEqualTo(Qos.AT_MOST_ONCE);
        assertThat(TopicKind.FIELD_REFERENCE.defaultQos()).isEqualTo(Qos.AT_LEAST_ONCE);
        assertThat(TopicKind.AREA_METER.idNames()).containsExactly("area", "meter");
    }

    @Property(tries = 200)
    void shouldParseEveryBuiltTopicBack(@ForAll("ids") String site, @ForAll TopicKind kind,
            @ForAll("ids") String first, @ForAll("ids") String second) {
        List<String> ids = List.of(first, second).subList(0, kind.idNames().size());
        String topic = TopicTree.forSite(site).topic(kind, ids.toArray(String[]::new));
        assertThat(TopicTree.parse(topic)).contains(new ParsedTopic(site, kind, ids));
    }

    @Provide
    Arbitrary<String> ids() {
        return MessageArbitraries.ids();
    }

    @Test
    void shouldGiveNamedIdsOfAParsedTopic() {
        ParsedTopic parsed = TopicTree.parse("loopstand/v1/s/area/north/meter/m2").orElseThrow();
        assertThat(parsed.area()).isEqualTo("north");
        assertThat(parsed.id("meter")).isEqualTo("m2");
        assertThatThrownBy(parsed::unit).isInstanceOf(IllegalArgumentException.class).hasMessageContaining("unit");
    }

    @ParameterizedTest
    @ValueSource(strings = {"", "loopstand", "loopstand/v1", "loopstand/v1/s", "loopstand/v2/s/clock",
            "other/v1/s/clock", "loopstand/v1/s/clock/extra", "loopstand/v1/s/unit/u1", "loopstand/v1/s/unit/u1/speed",
            "loopstand/v1/s/unit//telemetry", "loopstand/v1/s/unit/+/telemetry", "loopstand/v1/bad site/clock",
            "/loopstand/v1/s/clock", "loopstand/v1/s/area/a/meter", "loopstand/v1/s/field/unit/u1/telemetry",
            "loopstand/v1/s/unit/u1/telemetry/"})
    void shouldReturnEmptyForForeignTopics(String topic) {
        assertThat(TopicTree.parse(topic)).isEmpty();
    }

    @Test
    void shouldReturnEmptyForNull() {
        assertThat(TopicTree.parse(null)).isEqualTo(Optional.empty());
    }

    @ParameterizedTest
    @ValueSource(strings = {"", "-u1", "_u1", "u/1", "u+", "u#", "u 1", "é", "u.1"})
    void shouldRejectBadIdsNamingThem(String bad) {
        assertThatThrownBy(() -> tree.unitCommand(bad)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("unit id '" + bad + "'");
        assertThatThrownBy(() -> tree.areaMeter("north", bad)).hasMessageContaining("meter id '" + bad + "'");
        assertThatThrownBy(() -> TopicTree.forSite(bad)).hasMessageContaining("site id '" + bad + "'");
    }

    @Test
    void shouldRejectNullAndTooLongIds() {
        assertThatThrownBy(() -> tree.unitAck(null)).hasMessageContaining("unit id null");
        String sixtyFour = "a".repeat(64);
        assertThat(tree.unitAck(sixtyFour)).endsWith("/unit/" + sixtyFour + "/ack");
        assertThatThrownBy(() -> tree.unitAck(sixtyFour + "a")).hasMessageContaining("unit id");
        assertThatThrownBy(() -> tree.topic(TopicKind.AREA_METER, "north"))
                .hasMessageContaining("needs ids [area, meter]");
    }
}
