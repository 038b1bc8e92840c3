package org.loopstand.protocol.time;

import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Takes an emulated plant's time base from its clock topic, so a process other than the plant (a
 * pulse test, a unit interface in its own process) can run against a plant at an accelerated rate:
 * its commands' validUntil, telemetry and measured times are then in the plant's scenario time. Only a fresh tick is used (not the retained one, which may be up to a wall second
 * old, i.e. {@code rate} scenario seconds).
 */
public final class PlantClockFollower {
    private PlantClockFollower() {
    }

    /**
     * @param bus      connected bus
     * @param wall     the wall clock underneath
     * @param timeoutMs how long to wait for a fresh tick, wall ms
     * @return a clock running at the plant's rate from the tick's scenario time, or empty on timeout
     */
    public static Optional<Clock> await(MessageBus bus, TopicTree topics, Clock wall, long timeoutMs)
            throws InterruptedException {
        MessageCodec codec = new MessageCodec();
        CompletableFuture<Clock> first = new CompletableFuture<>();
        bus.subscribe(topics.clock(), Qos.AT_MOST_ONCE, m -> {
            if (!m.retained()) {
                codec.decode(m.payload(), ClockTick.class).message().filter(ClockTick::running)
                        .ifPresent(t -> first.complete(new AcceleratedClock(wall, t.rate(), t.sourceTime())));
            }
        });
        try {
            return Optional.of(first.get(timeoutMs, TimeUnit.MILLISECONDS));
        } catch (TimeoutException e) {
            return Optional.empty();
        } catch (ExecutionException e) {
            throw new IllegalStateException(e.getCause());
        } finally {
            bus.unsubscribe(topics.clock());
        }
    }
}
