package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.TieLine;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * TEST SCAFFOLDING, not the plant: until the real plant agent is merged, this adapter publishes
 * AreaMeter and UnitTelemetry from a {@link GridSimulator} and applies received UnitCommands to
 * its load references (a pulse moves the reference at the unit's pulse rate while it lasts; a
 * setpoint is approached at the unit's ramp). Expired commands are refused with an ack. One meter
 * per area, id {@code {area}-m1}.
 */
final class StudyPlantAdapter {
    private final GridSimulator sim;
    private final MessageBus bus;
    private final Clock clock;
    private final TopicTree topics;
    private final MessageCodec codec = new MessageCodec();
    private final ConcurrentLinkedQueue<UnitCommand> inbox = new ConcurrentLinkedQueue<>();
    private final Map<String, double[]> pulse = new HashMap<>(); // unit -> {endMs, signedRateMwPerMs}
    private final Map<String, Double> setpointTarget = new HashMap<>();
    private long seq;
    final List<UnitCommand> accepted = new ArrayList<>();
    /** areas whose meter stops publishing (fault injection in tests) */
    final java.util.Set<String> silentAreas = new java.util.HashSet<>();
    /** offset added to a tie flow as reported by the named area's meter, MW (a data error) */
    final Map<String, Double> tieErrorMwByArea = new HashMap<>();
    int refused;

    StudyPlantAdapter(GridSimulator sim, MessageBus bus, Clock clock) {
        this.sim = sim;
        this.bus = bus;
        this.clock = clock;
        this.topics = TopicTree.forSite(sim.grid().siteId());
        bus.subscribe(topics.filterAll(TopicKind.UNIT_COMMAND), Qos.AT_LEAST_ONCE, m -> {
            Decoded<UnitCommand> d = codec.decode(m.payload(), UnitCommand.class);
            d.message().ifPresent(inbox::add);
        });
    }

    /** Applies commands, then advances the physics to the clock's time, moving references on the way. */
    void advanceTo(long nowMs, double simTimeS) {
        UnitCommand c;
        while ((c = inbox.poll()) != null) {
            apply(c, nowMs);
        }
        double dtMs = (simTimeS - sim.timeS()) * 1000;
        for (GeneratingUnit u : sim.grid().units()) {
            double[] p = pulse.get(u.id());
            if (p != null) {
                double startMs = nowMs - dtMs;
                double activeMs = Math.max(0, Math.min(nowMs, p[0]) - startMs);
                if (activeMs > 0) {
                    sim.setLoadReferenceMw(u.id(), sim.loadReferenceMw(u.id()) + p[1] * activeMs);
                }
                if (p[0] <= nowMs) {
                    pulse.remove(u.id());
                }
            }
            Double target = setpointTarget.get(u.id());
            if (target != null) {
                double ref = sim.loadReferenceMw(u.id());
                double maxStep = u.rampMwPerMin() / 60000.0 * dtMs;
                sim.setLoadReferenceMw(u.id(), ref + Math.max(-maxStep, Math.min(maxStep, target - ref)));
            }
        }
        sim.advanceTo(simTimeS);
    }

    private void apply(UnitCommand c, long nowMs) {
        GeneratingUnit u = sim.grid().units().get(sim.grid().unitIndex(c.unit()));
        boolean expired = nowMs > c.validUntil();
        if (!expired) {
            if (c.kind() == CommandKind.PULSE) {
                double sign = c.direction() == PulseDirection.RAISE ? 1 : -1;
                pulse.put(u.id(), new double[] {nowMs + c.durationMs(), sign * u.pulseRateMwPerMin() / 60000.0});
                setpointTarget.remove(u.id());
            } else {
                setpointTarget.put(u.id(), Math.max(u.regulatingMinMw(), Math.min(u.regulatingMaxMw(), c.setpointMw())));
            }
            accepted.add(c);
        } else {
            refused++;
        }
        CommandAck ack = new CommandAck(++seq, nowMs, c.unit(), c.seq(), c.controllerId(),
                expired ? AckOutcome.REJECTED : AckOutcome.ACCEPTED, expired ? RefusalReason.EXPIRED : null, null);
        bus.publish(OutboundMessage.of(topics.unitAck(c.unit()), codec.encode(ack), Qos.AT_LEAST_ONCE));
    }

    /** Publishes one meter per area and every unit's telemetry, stamped with the clock. */
    void publishScan() {
        long now = clock.epochMillis();
        for (Area a : sim.grid().areas()) {
            if (silentAreas.contains(a.id())) {
                continue;
            }
            List<TieFlow> flows = new ArrayList<>();
            for (TieLine t : sim.grid().ties()) {
                if (t.fromArea().equals(a.id()) || t.toArea().equals(a.id())) {
                    double sign = t.fromArea().equals(a.id()) ? 1 : -1;
                    flows.add(new TieFlow(t.id(), sign * sim.tieFlowMw(t.id())
                            + tieErrorMwByArea.getOrDefault(a.id(), 0.0), Quality.GOOD));
                }
            }
            AreaMeter m = new AreaMeter(++seq, now, a.id(), a.id() + "-m1", sim.frequencyHz(a.id()), Quality.GOOD,
                    flows, sim.netInterchangeMw(a.id()), Quality.GOOD);
            bus.publish(OutboundMessage.of(topics.areaMeter(a.id(), a.id() + "-m1"), codec.encode(m), Qos.AT_MOST_ONCE));
        }
        for (GeneratingUnit u : sim.grid().units()) {
            UnitTelemetry t = new UnitTelemetry(++seq, now, u.id(), sim.outputMw(u.id()), Quality.GOOD,
                    sim.loadReferenceMw(u.id()), sim.isTripped(u.id()) ? UnitStatus.TRIPPED : UnitStatus.ONLINE,
                    ControlMode.REMOTE, u.regulatingMinMw(), u.regulatingMaxMw(), u.rampMwPerMin(),
                    u.pulseRateMwPerMin(), u.acceptsSetpoints(), 0);
            bus.publish(OutboundMessage.of(topics.unitTelemetry(u.id()), codec.encode(t), Qos.AT_MOST_ONCE));
        }
    }
}
