package org.loopstand.protocol.topic;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.VirtualClock;

class UnitTopicRouterTest {
    private final VirtualClock clock = new VirtualClock(1_700_000_000_000L);
    private final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    private final TopicTree site = TopicTree.forSite("north-grid");
    /** the unit host's connection, the one the wildcards are subscribed on */
    private final InMemoryBus host = broker.connect("unit-host");
    /** the other side, publishing commands */
    private final InMemoryBus controller = broker.connect("controller");
    /** commands routed over one wildcard on the host's connection */
    private final UnitTopicRouter router = new UnitTopicRouter("north-grid").route(TopicKind.UNIT_COMMAND, host, Qos.AT_LEAST_ONCE);
    /** what the units subscribe through */
    private final MessageBus view = router.view(host);

    private static OutboundMessage msg(String topic, String payload) {
        return OutboundMessage.of(topic, payload.getBytes(UTF_8), Qos.AT_LEAST_ONCE);
    }

    @Test
    void shouldHandEachCommandToItsOwnUnitOverOneWildcardSubscription() {
        Inbox g1 = new Inbox();
        Inbox g2 = new Inbox();
        view.subscribe(site.unitCommand("g1"), Qos.AT_LEAST_ONCE, g1);
        view.subscribe(site.unitCommand("g2"), Qos.AT_LEAST_ONCE, g2);

        controller.publish(msg("loopstand/v1/north-grid/unit/g2/command", "raise g2"));
        controller.publish(msg("loopstand/v1/north-grid/unit/g1/command", "lower g1"));
        controller.publish(msg("loopstand/v1/north-grid/unit/g2/command", "lower g2"));

        assertThat(g1.payloads()).containsExactly("lower g1");
        assertThat(g2.payloads()).containsExactly("raise g2", "lower g2");
        assertThat(router.routedCount()).isEqualTo(3);
        // one broker subscription (the wildcard) carried all three: MQTT 5.0 section 4.7, '+' is one level
        assertThat(host.counters().received()).isEqualTo(3);
        assertThat(router.unitsServed(TopicKind.UNIT_COMMAND)).isEqualTo(2);
    }

    @Test
    void shouldCountAndDropMessagesForUnitsThisHostDoesNotServe() {
        InMemoryBus plant = broker.connect("plant");
        router.route(TopicKind.FIELD_READING, host, Qos.AT_MOST_ONCE);
        Inbox g1 = new Inbox();
        view.subscribe(site.fieldReading("g1"), Qos.AT_MOST_ONCE, g1);

        plant.publish(msg(site.fieldReading("g1"), "g1 at 101.5 MW"));
        plant.publish(msg(site.fieldReading("g3"), "g3 at 80.0 MW"));
        plant.publish(msg(site.fieldReading("g11"), "g11 at 40.0 MW"));

        assertThat(g1.payloads()).containsExactly("g1 at 101.5 MW");
        assertThat(router.notServedCount()).isEqualTo(2);
        assertThat(router.routedCount()).isEqualTo(1);
    }

    @Test
    void shouldPassOtherSubscriptionsAndPublishesToTheConnection() {
        Inbox status = new Inbox();
        Inbox acks = new Inbox();
        view.subscribe(site.filterAll(TopicKind.CONTROLLER_STATUS), Qos.AT_LEAST_ONCE, status);
        controller.subscribe(site.unitAck("g1"), Qos.AT_LEAST_ONCE, acks);

        controller.publish(msg(site.controllerStatus("agc-1"), "regulating"));
        view.publish(msg(site.unitAck("g1"), "accepted"));

        assertThat(status.payloads()).containsExactly("regulating");
        assertThat(acks.payloads()).containsExactly("accepted");
        assertThat(router.routedCount()).isZero();
    }

    @Test
    void shouldNotRouteAnotherSitesTopicsNorTakeASecondListenerForOneUnit() {
        Inbox g1 = new Inbox();
        Inbox otherSite = new Inbox();
        view.subscribe(site.unitCommand("g1"), Qos.AT_LEAST_ONCE, g1);
        // another site's command topic is no routed topic: it is subscribed on the connection as given
        view.subscribe(TopicTree.forSite("south-grid").unitCommand("g1"), Qos.AT_LEAST_ONCE, otherSite);
        controller.publish(msg(TopicTree.forSite("south-grid").unitCommand("g1"), "south"));

        assertThat(g1.payloads()).isEmpty();
        assertThat(otherSite.payloads()).containsExactly("south");
        assertThatThrownBy(() -> view.subscribe(site.unitCommand("g1"), Qos.AT_LEAST_ONCE, new Inbox()))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("unit/g1/command");
        assertThatThrownBy(() -> router.route(TopicKind.AREA_METER, host, Qos.AT_MOST_ONCE))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("AREA_METER");
    }

    @Test
    void shouldStopHandingMessagesToAUnitAfterItUnsubscribes() {
        Inbox g1 = new Inbox();
        view.subscribe(site.unitCommand("g1"), Qos.AT_LEAST_ONCE, g1);
        controller.publish(msg(site.unitCommand("g1"), "first"));
        view.unsubscribe(site.unitCommand("g1"));
        controller.publish(msg(site.unitCommand("g1"), "second"));

        assertThat(g1.payloads()).containsExactly("first");
        assertThat(router.notServedCount()).isEqualTo(1);
    }
}
