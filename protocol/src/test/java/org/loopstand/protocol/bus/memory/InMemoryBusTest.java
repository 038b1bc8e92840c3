package org.loopstand.protocol.bus.memory;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.VirtualClock;

class InMemoryBusTest {
    private final VirtualClock clock = new VirtualClock(1_700_000_000_000L);

    private static OutboundMessage msg(String topic, String payload) {
        return OutboundMessage.of(topic, payload.getBytes(UTF_8), Qos.AT_LEAST_ONCE);
    }

    private static OutboundMessage retained(String topic, String payload, long expiryS) {
        return new OutboundMessage(topic, payload.getBytes(UTF_8), Qos.AT_LEAST_ONCE, true, expiryS);
    }

    @Test
    void shouldRouteByFilterWithWildcards() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus ctl = broker.connect("controller");
        InMemoryBus plant = broker.connect("plant");
        Inbox freq = new Inbox();
        Inbox all = new Inbox();
        ctl.subscribe("rig/area/+/freq", Qos.AT_LEAST_ONCE, freq);
        ctl.subscribe("rig/#", Qos.AT_MOST_ONCE, all);

        plant.publish(msg("rig/area/north/freq", "49.97"));
        plant.publish(msg("rig/area/north/tie/south", "120.5"));
        plant.publish(msg("other/area/north/freq", "50.0"));

        assertThat(freq.payloads()).containsExactly("49.97");
        assertThat(all.payloads()).containsExactly("49.97", "120.5");
        assertThat(all.messages().get(0).qos()).as("QoS capped by the subscription").isEqualTo(Qos.AT_MOST_ONCE);
        assertThat(freq.messages().get(0).receivedNanos()).isEqualTo(clock.monotonicNanos());
        assertThat(plant.counters().sent()).isEqualTo(3);
        assertThat(ctl.counters().received()).isEqualTo(3);
    }

    @Test
    void shouldReachExactlyTheSubscriptionsOfTheMomentWhenTheSameTopicIsPublishedAgain() {
        // The broker keeps each topic's subscriptions between publishes: every change must show at once.
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus plant = broker.connect("plant");
        InMemoryBus ctl = broker.connect("controller");
        Inbox first = new Inbox();
        Inbox second = new Inbox();
        Inbox late = new Inbox();
        ctl.subscribe("rig/area/+/freq", Qos.AT_LEAST_ONCE, first);
        plant.publish(msg("rig/area/north/freq", "1"));
        ctl.subscribe("rig/#", Qos.AT_LEAST_ONCE, second);
        plant.publish(msg("rig/area/north/freq", "2"));
        InMemoryBus other = broker.connect("other");
        other.subscribe("rig/area/north/freq", Qos.AT_LEAST_ONCE, late);
        plant.publish(msg("rig/area/north/freq", "3"));
        ctl.unsubscribe("rig/area/+/freq");
        plant.publish(msg("rig/area/north/freq", "4"));
        other.drop(false);
        plant.publish(msg("rig/area/north/freq", "5"));
        other.reconnect();
        plant.publish(msg("rig/area/north/freq", "6"));

        assertThat(first.payloads()).containsExactly("1", "2", "3");
        assertThat(second.payloads()).containsExactly("2", "3", "4", "5", "6");
        assertThat(late.payloads()).containsExactly("3", "4", "6");
    }

    @Test
    void shouldDeliverRetainedValueOnSubscribeAndClearItWithEmptyPayload() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus plant = broker.connect("plant");
        plant.publish(retained("rig/unit/u1/status", "online", 0));
        plant.publish(retained("rig/unit/u1/status", "tripped", 0)); // replaces the older value

        Inbox late = new Inbox();
        broker.connect("late").subscribe("rig/unit/+/status", Qos.AT_LEAST_ONCE, late);
        assertThat(late.payloads()).containsExactly("tripped");
        assertThat(late.messages().get(0).retained()).isTrue();

        plant.publish(retained("rig/unit/u1/status", "", 0));
        Inbox later = new Inbox();
        broker.connect("later").subscribe("rig/unit/+/status", Qos.AT_LEAST_ONCE, later);
        assertThat(later.size()).isZero();
        assertThat(late.messages().get(1).retained()).as("live delivery").isFalse();
    }

    @Test
    void shouldPublishLastWillWhenKilledButNotWhenClosed() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        Inbox wills = new Inbox();
        broker.connect("watcher").subscribe("rig/alive/+", Qos.AT_LEAST_ONCE, wills);
        InMemoryBus crashing = broker.connect("crashing", msg("rig/alive/crashing", "lost"));
        InMemoryBus tidy = broker.connect("tidy", msg("rig/alive/tidy", "lost"));
        List<Throwable> causes = new ArrayList<>();
        crashing.addConnectionListener(new org.loopstand.protocol.bus.ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
            }

            @Override
            public void onDisconnected(Throwable cause) {
                causes.add(cause);
            }
        });

        crashing.kill();
        tidy.close();

        assertThat(wills.messages()).extracting(m -> m.topic()).containsExactly("rig/alive/crashing");
        assertThat(crashing.isConnected()).isFalse();
        assertThat(causes).hasSize(1);
        assertThat(broker.connect("crashing")).as("client id free again").isNotNull();
    }

    @Test
    void shouldNotDeliverRetainedOrQueuedMessagesPastTheirExpiry() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.LOCKSTEP);
        InMemoryBus plant = broker.connect("plant");
        Inbox inbox = new Inbox();
        broker.connect("ctl").subscribe("rig/meter/#", Qos.AT_LEAST_ONCE, inbox);
        plant.publish(new OutboundMessage("rig/meter/a", "short".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false, 1));
        plant.publish(new OutboundMessage("rig/meter/b", "long".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false, 5));
        plant.publish(retained("rig/meter/c", "kept-1s", 1));

        clock.advanceMillis(1_000); // exactly 1 s: the 1 s messages have expired
        broker.deliverPending();

        assertThat(inbox.payloads()).containsExactly("long");
        assertThat(broker.expiredCount()).isEqualTo(2);
        assertThat(broker.retained("rig/meter/c")).isEmpty();
    }

    @Test
    void shouldDeliverInFifoOrderInLockstepIncludingMessagesPublishedDuringDelivery() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.LOCKSTEP);
        InMemoryBus plant = broker.connect("plant");
        InMemoryBus ctl = broker.connect("ctl");
        List<String> order = new ArrayList<>();
        ctl.subscribe("rig/meter/+", Qos.AT_LEAST_ONCE, m -> {
            String p = new String(m.payload(), UTF_8);
            order.add("ctl:" + p);
            ctl.publish(msg("rig/cmd/u1", "cmd-for-" + p)); // queued behind what is already pending
        });
        plant.subscribe("rig/cmd/+", Qos.AT_LEAST_ONCE, m -> order.add("plant:" + new String(m.payload(), UTF_8)));

        plant.publish(msg("rig/meter/a", "m1"));
        plant.publish(msg("rig/meter/a", "m2"));
        assertThat(order).as("nothing before deliverPending").isEmpty();
        assertThat(broker.pendingCount()).isEqualTo(2);

        int delivered = broker.deliverPending();

        assertThat(delivered).isEqualTo(4);
        assertThat(order).containsExactly("ctl:m1", "ctl:m2", "plant:cmd-for-m1", "plant:cmd-for-m2");
        assertThat(broker.pendingCount()).isZero();
    }

    @Test
    void shouldStopAnEndlessPublishLoop() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.LOCKSTEP);
        InMemoryBus echo = broker.connect("echo");
        echo.subscribe("rig/loop", Qos.AT_MOST_ONCE, m -> echo.publish(msg("rig/loop", "again")));
        echo.publish(msg("rig/loop", "start"));
        assertThatThrownBy(broker::deliverPending).isInstanceOf(IllegalStateException.class)
                .hasMessageContaining("publishing in a loop");
    }

    @Test
    void shouldFailPublishAfterCloseAndCountIt() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus bus = broker.connect("c");
        bus.close();
        assertThatThrownBy(() -> bus.publish(msg("rig/x", "y")).get()).isInstanceOf(ExecutionException.class)
                .cause().isInstanceOf(BusException.class);
        assertThat(bus.counters().sendFailed()).isEqualTo(1);
    }

    @Test
    void shouldRefuseSecondConnectionWithSameClientIdAndCountRejectedListenerFailures() {
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus bus = broker.connect("c");
        assertThatThrownBy(() -> broker.connect("c")).hasMessageContaining("already connected");
        bus.subscribe("rig/x", Qos.AT_LEAST_ONCE, m -> {
            throw new IllegalArgumentException("bad payload");
        });
        bus.publish(msg("rig/x", "y"));
        assertThat(bus.counters().rejected()).isEqualTo(1);
    }
}
