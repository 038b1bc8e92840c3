package org.loopstand.plant.runtime;

import java.util.List;

import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.meter.AreaMeterPublisher;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Runs the meter scans that are due: each reading goes out on its area meter topic (through the fault
 * stage when faults are wired), or is dropped, never buffered, while the plant link is down (a late
 * reading would pass for a fresh one). Every reading is counted and journaled. Loop thread only;
 * the counts may be read from any thread.
 *
 * <p>Scans fall due on the clock (a meter's scan does not wait for the physics), but a reading's
 * {@code sourceTime} is the time of the physics state it was read from ({@link PhysicsEpoch}): while
 * the physics lags the clock by N s the reading is N s old, and says so. The journal entry keeps the
 * clock's time: it records when the reading went out.
 */
final class MeterScan {
    private final List<AreaMeterPublisher> meters;
    private final GridSimulator sim;
    private final PhysicsEpoch physicsEpoch;
    private final Clock clock;
    private final MessageBus plantBus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private PlantCounters counters;
    private volatile long sent;
    private volatile long dropped;

    MeterScan(List<AreaMeterPublisher> meters, GridSimulator sim, PhysicsEpoch physicsEpoch, Clock clock,
              MessageBus plantBus, TopicTree topics, MessageCodec codec) {
        this.meters = meters;
        this.sim = sim;
        this.physicsEpoch = physicsEpoch;
        this.clock = clock;
        this.plantBus = plantBus;
        this.topics = topics;
        this.codec = codec;
    }

    void countInto(PlantCounters c) {
        this.counters = c;
    }

    /**
     * @param nowNanos the clock's monotonic reading, ns
     * @param journal  where readings are journaled, may be null
     * @param faults   the fault stages, may be null
     * @return readings taken
     */
    int scanDue(long nowNanos, PlantRunJournal journal, FaultHooks faults) {
        int n = 0;
        for (AreaMeterPublisher m : meters) {
            if (!m.due(nowNanos)) {
                continue;
            }
            AreaMeter reading = m.scan(sim, nowNanos, physicsEpoch.nowEpochMs());
            n++;
            String topic = topics.areaMeter(reading.area(), reading.meter());
            byte[] payload = codec.encode(reading);
            boolean connected = plantBus.isConnected();
            if (counters != null) {
                counters.published("AreaMeter", connected, "notConnected");
            }
            String note;
            if (!connected) {
                dropped++;
                note = "notConnected";
            } else if (faults != null) {
                sent++;
                faults.publishMeter(reading); // the fault stage decides what goes out
                note = "throughFaultStage";
            } else {
                sent++;
                plantBus.publish(OutboundMessage.of(topic, payload, Qos.AT_MOST_ONCE));
                note = null;
            }
            if (journal != null) {
                journal.published(clock.epochMillis(), topic, "AreaMeter", reading.seq(), connected, note, payload, null);
            }
        }
        return n;
    }

    long sentCount() {
        return sent;
    }

    long droppedCount() {
        return dropped;
    }
}
