package org.loopstand.plant.runtime;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Publishes the scenario clock, retained, once a wall second (at every rate, 1 included: controllers
 * take scenario time from it, docs/controller-contract.md). While a {@link HeldStartClock} holds, the
 * tick says the clock is not running. Loop thread only.
 */
final class PlantClockPublisher {
    private final Clock clock;
    private final MessageBus plantBus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final double rate;
    private final long periodNanos;
    private long nextNanos;
    private long seq;

    /**
     * @param rate       scenario seconds per wall second, &gt; 0
     * @param startNanos the clock's monotonic reading at the run's start, ns
     */
    PlantClockPublisher(Clock clock, MessageBus plantBus, TopicTree topics, MessageCodec codec, double rate, long startNanos) {
        this.clock = clock;
        this.plantBus = plantBus;
        this.topics = topics;
        this.codec = codec;
        this.rate = rate;
        // one clock tick per wall second
        this.periodNanos = Math.max(1_000_000_000L, Math.round(1e9 * rate));
        this.nextNanos = startNanos;
        this.seq = clock.epochMillis();
    }

    /**
     * @param nowNanos  the clock's monotonic reading, ns
     * @param simTimeS  simulated time, s
     * @return 1 when a tick went out, else 0
     */
    int publishIfDue(long nowNanos, double simTimeS) {
        boolean held = clock instanceof HeldStartClock h && !h.released();
        if (nowNanos < nextNanos || !plantBus.isConnected()) {
            return 0;
        }
        nextNanos += ((nowNanos - nextNanos) / periodNanos + 1) * periodNanos;
        ClockTick tick = new ClockTick(seq++, clock.epochMillis(), Math.round(simTimeS * 1000), rate,
                !held); // held: the controller's time stands still too
        plantBus.publish(new OutboundMessage(topics.clock(), codec.encode(tick), Qos.AT_MOST_ONCE, true, 0));
        return 1;
    }
}
