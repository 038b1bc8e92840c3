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

    private long seq;

    private OutboundMessage tick(long sourceTimeMs, double rate, boolean running, boolean retained) {
        return new OutboundMessage(TOPICS.clock(), codec.encode(new ClockTick(++seq, sourceTimeMs, sourceTimeMs, rate, running)),
                Qos.AT_MOST_ONCE, retained, 0);
    }

    @Test
    void shouldRunAtThePlantsRateFromTheFirstFreshRunningTickIgnoringTheRetainedOneAndAStoppedOne() throws Exception {
        VirtualClock wall = new VirtualClock(1_000);
        InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        InMemoryBus plant = broker.connect("site-a-plant");
        InMemoryBus unit = broker.connect("site-a-unit-u1");
        plant.publish(tick(5_000_000L, 20.0, true, true)); // retained: up to a wall second old, not used
        CompletableFuture<Optional<BusClock>> followed = CompletableFuture.supplyAsync(() -> {
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
        wall.advanceMillis(75);
        assertThat(clock.epochMillis()).as("75 wall ms at rate 20 (within the two tick periods it extrapolates)")
                .isEqualTo(9_000_000L + 1_500L);
    }

    @Test
    void shouldGiveUpWhenNoFreshTickComes() throws Exception {
        VirtualClock wall = new VirtualClock(1_000);
        InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        broker.connect("site-a-plant").publish(tick(5_000_000L, 20.0, true, true));
        assertThat(PlantClockFollower.await(broker.connect("site-a-unit-u1"), TOPICS, wall, 50)).isEmpty();
    }

    @Test
    void shouldFollowThePlantsHoldAndSlowDownAfterTheFirstTickWhenFed() throws Exception {
        VirtualClock wall = new VirtualClock(1_000);
        InMemoryBroker broker = new InMemoryBroker(wall, DeliveryMode.DIRECT);
        InMemoryBus plant = broker.connect("site-a-plant");
        InMemoryBus unit = broker.connect("site-a-unit-u1");
        CompletableFuture<Optional<BusClock>> followed = CompletableFuture.supplyAsync(() -> {
            try {
                return PlantClockFollower.follow(unit, TOPICS, wall, 10_000);
            } catch (InterruptedException e) {
                throw new IllegalStateException(e);
            }
        });
        while (!followed.isDone()) {
            plant.publish(tick(9_000_000L, 40.0, true, false));
            Thread.sleep(5);
        }
        BusClock clock = followed.get(10, TimeUnit.SECONDS).orElseThrow();
        // the follower's own subscription ended with the wait; the fed one must take the plant's later ticks
        plant.publish(tick(9_010_000L, 40.0, false, false)); // the pace keeper holds the plant's clock at +10 s
        wall.advanceMillis(2_000); // two wall seconds = 80 scenario seconds at the first tick's rate
        assertThat(clock.epochMillis()).as("held with the plant, not run on at 40x").isEqualTo(9_010_000L);
        plant.publish(tick(9_010_000L, 32.0, true, false)); // runs on at 0.8 x 40
        wall.advanceMillis(50);
        assertThat(clock.epochMillis()).as("50 wall ms at the slowed rate 32").isEqualTo(9_011_600L);
        assertThat(clock.rate()).isEqualTo(32.0);
    }
}
