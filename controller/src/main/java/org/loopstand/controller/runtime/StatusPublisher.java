package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.List;
import org.loopstand.controller.cycle.AreaCycleResult;
import org.loopstand.controller.cycle.CycleOutcome;
import java.util.Queue;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.ExcludedUnit;
import org.loopstand.protocol.message.SuspendedArea;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Publishes the controller's retained {@link ControllerStatus} (QoS 1), numbered and signed when a
 * seal is set; a failed publish goes to the agent's failure queue. Agent thread only, except the
 * publish completions.
 */
final class StatusPublisher {
    private final MessageBus bus;
    private final Clock clock;
    private final String topic;
    private final MessageCodec codec;
    private final String controllerId;
    private final long epoch;
    private final Queue<String> publishFailures;
    private StatusSeal seal;
    private long statusSeq;
    private long statusesSent;

    StatusPublisher(MessageBus bus, Clock clock, TopicTree topics, MessageCodec codec, String controllerId, long epoch,
                    Queue<String> publishFailures) {
        this.bus = bus;
        this.clock = clock;
        this.topic = topics.controllerStatus(controllerId);
        this.codec = codec;
        this.controllerId = controllerId;
        this.epoch = epoch;
        this.publishFailures = publishFailures;
    }

    void sealWith(StatusSeal statusSeal) {
        this.seal = statusSeal;
    }

    void publish(ControllerState state, List<String> reasons, long cycleNumber, List<AreaAce> aces,
                 List<ExcludedUnit> excluded, List<SuspendedArea> suspended) {
        long nowMs = Math.max(1, clock.epochMillis());
        ControllerStatus unsigned = new ControllerStatus(++statusSeq, nowMs, controllerId, epoch, state, reasons,
                Math.max(0, cycleNumber), aces, excluded, suspended);
        ControllerStatus s = seal == null ? unsigned : seal.sign(unsigned, nowMs);
        bus.publish(new OutboundMessage(topic, codec.encode(s), Qos.AT_LEAST_ONCE, true, 0)).whenComplete((v, e) -> {
            if (e != null) {
                publishFailures.add("status " + s.seq() + ": " + e);
            }
        });
        statusesSent++;
    }

    long statusesSent() {
        return statusesSent;
    }

    /** @return each area's ACE as the status shows it (areas with no known ACE left out, values clamped) */
    static List<AreaAce> areaAces(CycleOutcome o) {
        List<AreaAce> out = new ArrayList<>();
        for (AreaCycleResult r : o.areas()) {
            if (r.ace() == null || !Double.isFinite(r.aceMw())) {
                continue; // unknown ACE is not published as a number; the reasons say why
            }
            double filtered = r.regulation() == null ? r.aceMw() : r.regulation().filteredAceMw();
            String band = r.regulation() == null ? "held" : r.regulation().band().code();
            out.add(new AreaAce(r.areaId(), clampMw(r.aceMw()), clampMw(filtered), band));
        }
        return out;
    }

    private static double clampMw(double mw) {
        return Math.max(-1e6, Math.min(1e6, mw));
    }
}
