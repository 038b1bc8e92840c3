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
 * pulse test, a unit interface in its own process) runs on the plant's scenario time: its commands'
 * validUntil, telemetry and measured times are then in the plant's time, and a plant whose pace keeper
 * holds or slows its clock holds or slows them too (every later tick is followed, {@link #feed}). Only
 * fresh ticks are used (not the retained one, which may be up to a wall second old, i.e. {@code rate}
 * scenario seconds).
 */
public final class PlantClockFollower {
    private PlantClockFollower() {
    }

    /**
     * Waits for the first fresh running tick; the subscription ends with the wait (the caller may follow
     * on another connection with {@link #feed}).
     *
     * @param bus       connected bus
     * @param wall      the wall clock underneath
     * @param timeoutMs how long to wait for a fresh tick, wall ms
     * @return a clock anchored on that tick, or empty on timeout
     */
    public static Optional<BusClock> await(MessageBus bus, TopicTree topics, Clock wall, long timeoutMs)
            throws InterruptedException {
        return await(bus, topics, wall, timeoutMs, BusClock.WhenSilent.RUN_BLIND);
    }

    /**
     * As {@link #await(MessageBus, TopicTree, Clock, long)}, for a clock that does {@code whenSilent} once
     * the plant's ticks stop.
     */
    public static Optional<BusClock> await(MessageBus bus, TopicTree topics, Clock wall, long timeoutMs,
                                           BusClock.WhenSilent whenSilent) throws InterruptedException {
        MessageCodec codec = new MessageCodec();
        CompletableFuture<BusClock> first = new CompletableFuture<>();
        bus.subscribe(topics.clock(), Qos.AT_MOST_ONCE, m -> {
            if (!m.retained()) {
                codec.decode(m.payload(), ClockTick.class).message().filter(ClockTick::running).ifPresent(t -> {
                    BusClock c = new BusClock(wall, whenSilent);
                    c.onTick(t);
                    first.complete(c);
                });
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

    /**
     * Feeds every later fresh tick on {@code bus} to {@code clock} for as long as the connection lives
     * (the link resubscribes after a reconnect), so the clock follows the plant's holds, slow-downs and
     * restarts instead of running on at the first tick's rate.
     */
    public static void feed(MessageBus bus, TopicTree topics, BusClock clock) {
        MessageCodec codec = new MessageCodec();
        bus.subscribe(topics.clock(), Qos.AT_MOST_ONCE, m -> {
            if (!m.retained()) {
                codec.decode(m.payload(), ClockTick.class).message().ifPresent(clock::onTick);
            }
        });
    }

    /**
     * {@link #await} and then {@link #feed} on the same connection.
     *
     * @return the followed clock, or empty when no fresh running tick came within {@code timeoutMs} wall ms
     */
    public static Optional<BusClock> follow(MessageBus bus, TopicTree topics, Clock wall, long timeoutMs)
            throws InterruptedException {
        Optional<BusClock> clock = await(bus, topics, wall, timeoutMs);
        clock.ifPresent(c -> feed(bus, topics, c));
        return clock;
    }
}
