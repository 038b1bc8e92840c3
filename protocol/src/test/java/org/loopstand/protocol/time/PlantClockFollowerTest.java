package org.loopstand.protocol.time;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.topic.TopicTree;

class PlantClockFollowerTest {
    private static final TopicTree TOPICS = TopicTree.forSite("site-a");
    private final MessageCodec codec = new MessageCodec();

    private OutboundMessage tick(long sourceTimeMs, double rate, boolean running, boolean retained) {
        return new OutboundMessage(TOPICS.clock(), codec.encode(new ClockTick(1, sourceTimeMs, sourceTimeMs, rate, running)),
                Qos.AT_MOST_ONCE, retained, 0);
    }

    @Test
    void shouldRunAtThePlantsRateFromTheFirstFreshRunningTickIgnoringTheRetainedOneAndAStoppedOne() throws Exception {
        VirtualClock wall = new VirtualClock(1_000);
        InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        InMemoryBus plant = broker.connect("site-a-plant");
        InMemoryBus unit = broker.connect("site-a-unit-u1");
        plant.publish(tick(5_000_000L, 20.0, true, true)); // retained: up to a wall second old, not used
        CompletableFuture<Optional<Clock>> followed = CompletableFuture.supplyAsync(() -> {
            try {
                return PlantClockFollower.await(unit, TOPICS, wall, 10_000);
            } catch (InterruptedException e) {
                throw new IllegalStateException(e);
            }
        });
        while (!followed.isDone()) { // until the follower has subscribed and taken a tick
            plant.publish(tick(7_000_000L, 10.0, false, false)); // stopped: not used
            plant.publish(tick(9_000_000L, 20.0, true, false));
            Thread.sleep(5);
        }
        Clock clock = followed.get(10, TimeUnit.SECONDS).orElseThrow();
        assertThat(clock.epochMillis()).isEqualTo(9_000_000L);
        wall.advanceMillis(1_500);
        assertThat(clock.epochMillis()).as("1.5 wall s at rate 20").isEqualTo(9_000_000L + 30_000L);
    }

    @Test
    void shouldGiveUpWhenNoFreshTickComes() throws Exception {
        VirtualClock wall = new VirtualClock(1_000);
        InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        broker.connect("site-a-plant").publish(tick(5_000_000L, 20.0, true, true));
        assertThat(PlantClockFollower.await(broker.connect("site-a-unit-u1"), TOPICS, wall, 50)).isEmpty();
    }
}
