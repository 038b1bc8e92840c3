package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.plant.field.FieldGateway;
import org.loopstand.plant.meter.AreaMeterPublisher;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.scenario.ScenarioContext;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The plant's one loop: steps the physics up to the clock's now (at most {@value #MAX_STEPS_PER_CYCLE}
 * steps per cycle, then the rest next cycle), lets every in-process unit interface handle its queued
 * commands and tick after each step, runs due meter scans, serves the field topics of units that run
 * elsewhere, applies operator orders and, when the rate is not 1, publishes the scenario clock. All
 * bus input reaches it through bounded queues, so nothing on a bus thread can hold it up.
 *
 * <p>Simulated time 0 is the clock's reading when the agent is built.
 */
public final class PlantAgent implements Agent, ScenarioContext {
    public static final int MAX_STEPS_PER_CYCLE = 250;

    /** What the agent runs. */
    public record Parts(GridSimulator sim, Clock clock, MessageBus plantBus, TopicTree topics, MessageCodec codec,
                        List<AreaMeterPublisher> meters, List<UnitHost> units, FieldGateway field,
                        OperatorOrders orders, List<ScenarioEvent> events, double rate, StepLateness lateness) {
    }

    private final Parts p;
    private final long startNanos;
    private final long stepNanos;
    private final List<ScenarioEvent> events;
    private final long clockPeriodNanos;
    private int nextEvent;
    private long nextClockNanos;
    private long clockSeq;
    private volatile long meterDropped;
    private volatile long meterSent;
    private FaultHooks faults;
    /** Steps between two passes over one unit interface (1 = every unit after every step). */
    private int unitSlices = 1;

    public PlantAgent(Parts parts) {
        this.p = parts;
        this.startNanos = parts.clock().monotonicNanos();
        this.stepNanos = Math.round(parts.sim().stepS() * 1e9);
        this.events = new ArrayList<>(parts.events());
        // one clock tick per wall second
        this.clockPeriodNanos = Math.max(1_000_000_000L, Math.round(1e9 * parts.rate()));
        this.nextClockNanos = startNanos;
        this.clockSeq = parts.clock().epochMillis();
    }

    /**
     * Owner thread, before start: runs each unit plant interface every {@code unitScanMs} instead of
     * after every physics step. The units are dealt into {@code unitScanMs / step} slices and one
     * slice runs after each step, so the cost is spread evenly and every interface still runs once
     * per scan period. A unit's load reference then moves in scan-sized increments (its total motion
     * is unchanged: each tick advances by the time since its previous tick), commands and statuses
     * wait in their queues up to one scan period, and telemetry scans land on the unit's next pass
     * (up to one scan period late). 0 or a value ≤ the step: every unit after every step (default).
     *
     * @param unitScanMs unit interface scan period, ms, 0 – 1000
     */
    public void setUnitScanMs(long unitScanMs) {
        if (unitScanMs < 0 || unitScanMs > 1000) {
            throw new IllegalArgumentException("unitScanMs must be in [0, 1000], got " + unitScanMs);
        }
        this.unitSlices = (int) Math.max(1, unitScanMs * 1_000_000L / stepNanos);
    }

    /** Owner thread, before start: meters publish through the fault stages, faults are updated each cycle. */
    void attachFaults(FaultHooks hooks) {
        this.faults = hooks;
    }

    @Override
    public GridSimulator grid() {
        return p.sim();
    }

    @Override
    public String roleName() {
        return "plant-" + p.topics().site();
    }

    @Override
    public int doWork() {
        int work = p.orders() == null ? 0 : p.orders().work();
        if (faults != null) {
            work += faults.update(p.sim());
        }
        long now = p.clock().monotonicNanos();
        int steps = 0;
        while (steps < MAX_STEPS_PER_CYCLE) {
            long due = startNanos + (p.sim().stepCount() + 1) * stepNanos;
            if (now < due) {
                break;
            }
            fireEvents();
            p.sim().step();
            p.lateness().record(now - due);
            work += workUnits((int) (p.sim().stepCount() % unitSlices));
            steps++;
            now = p.clock().monotonicNanos();
        }
        if (steps == 0 && unitSlices == 1) {
            work += workUnits(0);
        }
        work += steps;
        if (p.field() != null) {
            work += p.field().work();
        }
        work += scanMeters(now);
        work += publishClock(now);
        return work;
    }

    /** Runs the unit interfaces of one slice: unit i belongs to slice i mod unitSlices. */
    private int workUnits(int slice) {
        int work = 0;
        List<UnitHost> units = p.units();
        for (int i = slice; i < units.size(); i += unitSlices) {
            work += units.get(i).work();
        }
        return work;
    }

    private void fireEvents() {
        double tol = p.sim().stepS() * 1e-6;
        while (nextEvent < events.size() && events.get(nextEvent).atS() <= p.sim().timeS() + tol) {
            events.get(nextEvent++).apply(this);
        }
    }

    private int scanMeters(long now) {
        int n = 0;
        for (AreaMeterPublisher m : p.meters()) {
            if (m.due(now)) {
                AreaMeter reading = m.scan(p.sim(), now, p.clock().epochMillis());
                n++;
                if (!p.plantBus().isConnected()) {
                    meterDropped++; // never buffered: a late reading would pass for a fresh one
                    continue;
                }
                meterSent++;
                if (faults != null) {
                    faults.publishMeter(reading);
                    continue;
                }
                p.plantBus().publish(OutboundMessage.of(p.topics().areaMeter(reading.area(), reading.meter()),
                        p.codec().encode(reading), Qos.AT_MOST_ONCE));
            }
        }
        return n;
    }

    private int publishClock(long now) {
        if (p.rate() == 1.0 || now < nextClockNanos || !p.plantBus().isConnected()) {
            return 0;
        }
        nextClockNanos += ((now - nextClockNanos) / clockPeriodNanos + 1) * clockPeriodNanos;
        ClockTick tick = new ClockTick(clockSeq++, p.clock().epochMillis(), Math.round(p.sim().timeS() * 1000),
                p.rate(), true);
        p.plantBus().publish(new OutboundMessage(p.topics().clock(), p.codec().encode(tick), Qos.AT_MOST_ONCE, true, 0));
        return 1;
    }

    /** @return meter readings dropped because the plant link was down */
    public long meterDroppedCount() {
        return meterDropped;
    }

    public long meterSentCount() {
        return meterSent;
    }

    public Parts parts() {
        return p;
    }
}
