package org.loopstand.plant.runtime;

import java.util.List;
import java.util.Map;

import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.plant.scenario.PlantControls;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The plant's controls as scenario events see them: a schedule change goes out retained on the
 * area's schedule topic, a control mode change reaches the unit's plant interface (here, or as an
 * operator order where it runs elsewhere). Loop thread only.
 *
 * <p>A schedule change is a scenario event: it fires when the physics reaches its time, and from that
 * time on the plant's truth ACE uses it. So it is stamped (and effective) at the physics' time, the
 * time base of the meter readings it is compared with, not at the clock's now, which is later while
 * the physics lags.
 */
final class BusPlantControls implements PlantControls {
    private final PhysicsEpoch physicsEpoch;
    private final MessageBus plantBus;
    private final TopicTree topics;
    private final MessageCodec codec;
    private final List<UnitDutyCycle> units;
    private long scheduleSeq;
    private long orderSeq;

    BusPlantControls(Clock clock, PhysicsEpoch physicsEpoch, MessageBus plantBus, TopicTree topics, MessageCodec codec,
                     List<UnitDutyCycle> units) {
        this.physicsEpoch = physicsEpoch;
        this.plantBus = plantBus;
        this.topics = topics;
        this.codec = codec;
        this.units = units;
        this.scheduleSeq = clock.epochMillis();
        this.orderSeq = clock.epochMillis();
    }

    @Override
    public void publishSchedule(String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
        long now = physicsEpoch.nowEpochMs();
        Schedule s = new Schedule(scheduleSeq++, now, area, scheduledNetInterchangeMw, scheduledFrequencyHz, now);
        // retained: a controller that connects later still finds the schedule in force
        plantBus.publish(new OutboundMessage(topics.areaSchedule(area), codec.encode(s), Qos.AT_LEAST_ONCE, true, 0));
    }

    /**
     * A unit whose interface runs here changes mode at once; one that runs elsewhere ({@code loopstand unit})
     * gets the operator's {@code setControlMode} order on the faults topic (QoS 1), as the fault tool sends it,
     * and journals it there.
     */
    @Override
    public void setControlMode(String unit, ControlMode mode, String why) {
        boolean here = false;
        for (UnitDutyCycle h : units) {
            if (h.unit().unitId().equals(unit)) {
                h.unit().setControlMode(mode, why);
                here = true;
            }
        }
        if (!here) {
            long now = physicsEpoch.nowEpochMs();
            long seq = orderSeq++;
            FaultOrder order = new FaultOrder(seq, now, "mode-" + seq, FaultAction.START, "setControlMode", List.of(unit),
                    Map.of("mode", mode.wireName()), null);
            plantBus.publish(new OutboundMessage(topics.faults(), codec.encode(order), Qos.AT_LEAST_ONCE, false, 0));
        }
    }
}
