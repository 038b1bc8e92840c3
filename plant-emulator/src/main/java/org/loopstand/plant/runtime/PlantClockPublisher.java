package org.loopstand.plant.runtime;

import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Publishes the scenario clock, retained, at once when scenario time starts, is held or changes rate,
 * and otherwise on the {@link ClockTickSchedule} (at every rate, 1 included: controllers take scenario
 * time from it, docs/controller-contract.md). While a {@link HeldStartClock} holds, the tick says the
 * clock is not running. Loop thread only.
 */
final class PlantClockPublisher {
    private final Clock clock;
    private final MessageBus plantBus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final double rate;
    private final ClockTickSchedule ticks = new ClockTickSchedule();
    private long seq;

    /**
     * @param rate       scenario seconds per wall second, &gt; 0
     */
    PlantClockPublisher(Clock clock, MessageBus plantBus, TopicTree topics, MessageCodec codec, double rate) {
        this.clock = clock;
        this.plantBus = plantBus;
        this.topics = topics;
        this.codec = codec;
        this.rate = rate;
        this.seq = clock.epochMillis();
    }

    /**
     * @param nowNanos  the clock's monotonic reading, ns
     * @param simTimeS  simulated time, s
     * @return 1 when a tick went out, else 0
     */
    int publishIfDue(long nowNanos, double simTimeS) {
        HeldStartClock held = clock instanceof HeldStartClock h ? h : null;
        boolean running = held == null || held.running(); // held: the controller's time stands still too
        double rateNow = held == null ? rate : held.currentRate();
        if (!plantBus.isConnected() || !ticks.due(nowNanos, running, rateNow)) {
            return 0;
        }
        ClockTick tick = new ClockTick(seq++, clock.epochMillis(), Math.round(simTimeS * 1000), rateNow, running);
        plantBus.publish(new OutboundMessage(topics.clock(), codec.encode(tick), Qos.AT_MOST_ONCE, true, 0));
        return 1;
    }
}
