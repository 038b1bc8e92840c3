package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.function.Consumer;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.field.FieldGateway;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.meter.AreaMeterPublisher;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.scenario.PlantControls;
import org.loopstand.plant.scenario.ScenarioContext;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The plant's one loop: steps the physics up to the clock's now (at most {@value #MAX_STEPS_PER_CYCLE}
 * steps per cycle, then the rest next cycle), lets every in-process unit interface handle its queued
 * commands and tick after each step, runs due meter scans, serves the field topics of units that run
 * elsewhere, applies operator orders and publishes the scenario clock ({@link ClockTickSchedule}). All
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
    private final ClockTickSchedule clockTicks = new ClockTickSchedule();
    private int nextEvent;
    private long clockSeq;
    private long scheduleSeq;
    private volatile long meterDropped;
    private volatile long meterSent;
    private final long startEpochMs;
    private final ConcurrentLinkedQueue<Map<String, Object>> pendingEvents =
            new ConcurrentLinkedQueue<>();
    private volatile PlantRunJournal journal;
    private double truthIntervalS = 1.0;
    private double nextTruthS;
    private double endAtS = Double.NaN;
    private volatile boolean finished;
    private final ConcurrentLinkedQueue<Runnable> loopTasks = new ConcurrentLinkedQueue<>();
    private RunRecord record;
    private List<CheckSpec> checks = List.of();
    private Consumer<String> checkSink = s -> { };
    private double nextSampleS;
    private FaultHooks faults;
    /** Steps between two passes over one unit interface (1 = every unit after every step). */
    private int unitSlices = 1;
    private PlantCounters counters;
    private Consumer<PlantAgent> sampler;

    public PlantAgent(Parts parts) {
        this.p = parts;
        this.startNanos = parts.clock().monotonicNanos();
        this.stepNanos = Math.round(parts.sim().stepS() * 1e9);
        this.events = new ArrayList<>(parts.events());
        this.clockSeq = parts.clock().epochMillis();
        this.scheduleSeq = parts.clock().epochMillis();
        this.startEpochMs = parts.clock().epochMillis();
    }

    /**
     * Journals the run from now on (call before the loop starts): physics truth every
     * {@code truthIntervalS} of scenario time, meter messages, scenario and process events, step
     * lateness. The agent closes the journal in {@link #onClose()}.
     */
    public void journalTo(PlantRunJournal j, double truthIntervalS) {
        if (!(truthIntervalS > 0)) {
            throw new IllegalArgumentException("truthIntervalS must be positive, got " + truthIntervalS);
        }
        this.truthIntervalS = truthIntervalS;
        this.nextTruthS = p.sim().timeS();
        this.journal = j;
    }

    /** Ends the scenario at {@code endAtS} of simulated time: no step beyond it, then {@link #finished()}. */
    public void endAt(double endAtS) {
        if (!(endAtS > 0)) {
            throw new IllegalArgumentException("endAtS must be positive, got " + endAtS);
        }
        this.endAtS = endAtS;
    }

    /** @return true once the scenario's end time was reached (the loop then publishes nothing more) */
    public boolean finished() {
        return finished;
    }

    /**
     * Keeps a run record for the scenario's checks (call before the loop starts): truth sampled every
     * scenario second, scenario events; when the scenario ends the checks are decided, journaled as
     * {@code check} entries and each told to {@code sink} as one line.
     */
    public void checkWith(RunRecord r, List<CheckSpec> specs,
                          Consumer<String> sink) {
        this.record = r;
        this.checks = List.copyOf(specs);
        this.checkSink = sink;
        this.nextSampleS = p.sim().timeS();
    }

    /** Any thread: runs {@code task} on the loop's thread at its next cycle (e.g. feeding the run record). */
    public void runOnLoop(Runnable task) {
        loopTasks.add(task);
    }

    /** Any thread: queues a process event for the journal ({@code fields} holds {@code event}). */
    public void noteEvent(Map<String, Object> fields) {
        pendingEvents.add(fields);
    }

    /** @return scenario epoch ms of simulated time {@code timeS} (time 0 = the agent's start) */
    public long epochMsAt(double timeS) {
        return startEpochMs + Math.round(timeS * 1000);
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

    /** Before start: every meter message sent or dropped is counted into {@code c} as the journal records it. */
    public void countInto(PlantCounters c) {
        this.counters = c;
    }

    /**
     * Before start: {@code sampler} runs on the loop's thread after every cycle (it decides itself
     * whether to take a sample; it must be cheap).
     */
    public void sampleWith(Consumer<PlantAgent> sampler) {
        this.sampler = sampler;
    }

    /** Loop thread only (a sampler): the fault engine's state, or null when no faults are wired. */
    public org.loopstand.plant.fault.FaultEngine faultEngineOnLoop() {
        return faults == null ? null : faults.engine();
    }

    /** Owner thread, before start: meters publish through the fault stages, faults are updated each cycle. */
    void attachFaults(FaultHooks hooks) {
        this.faults = hooks;
    }

    @Override
    public GridSimulator grid() {
        return p.sim();
    }

    /** Scenario events reach the plant's units and the schedule topic through this. */
    @Override
    public PlantControls plant() {
        return controls;
    }

    private final PlantControls controls = new PlantControls() {
        @Override
        public void publishSchedule(String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
            long now = p.clock().epochMillis();
            Schedule s = new Schedule(scheduleSeq++, now, area,
                    scheduledNetInterchangeMw, scheduledFrequencyHz, now);
            // retained: a controller that connects later still finds the schedule in force
            p.plantBus().publish(new OutboundMessage(p.topics().areaSchedule(area), p.codec().encode(s), Qos.AT_LEAST_ONCE,
                    true, 0));
        }

        @Override
        public void setControlMode(String unit, ControlMode mode, String why) {
            for (UnitHost h : p.units()) {
                if (h.unit().unitId().equals(unit)) {
                    h.unit().setControlMode(mode, why);
                }
            }
        }
    };

    @Override
    public String roleName() {
        return "plant-" + p.topics().site();
    }

    @Override
    public int doWork() {
        int work = p.orders() == null ? 0 : p.orders().work();
        for (Runnable t; (t = loopTasks.poll()) != null; work++) {
            t.run();
        }
        if (faults != null) {
            work += faults.update(p.sim());
        }
        long now = p.clock().monotonicNanos();
        int steps = 0;
        PlantRunJournal j = journal;
        while (steps < MAX_STEPS_PER_CYCLE && !finished) {
            long due = startNanos + (p.sim().stepCount() + 1) * stepNanos;
            if (now < due) {
                break;
            }
            if (p.sim().timeS() >= endAtS - p.sim().stepS() * 1e-6) {
                finished = true;
                break;
            }
            fireEvents();
            p.sim().step();
            p.lateness().record(now - due);
            if (j != null) {
                j.record(PlantRunJournal.STEP_LATENESS_US, Math.max(0, now - due) / 1_000);
                writeTruthIfDue(j);
            }
            if (record != null && p.sim().timeS() + p.sim().stepS() * 1e-6 >= nextSampleS) {
                record.sampleTruth(p.sim().timeS(), p.sim());
                nextSampleS += 1.0 * (Math.floor(p.sim().timeS() - nextSampleS + 1e-9) + 1);
            }
            work += workUnits((int) (p.sim().stepCount() % unitSlices));
            steps++;
            now = p.clock().monotonicNanos();
        }
        if (finished) {
            // the scenario is over: physics, meters and units stand still; only the journal is kept flushed
            if (j != null) {
                j.flushIfDue();
            }
            if (sampler != null) {
                sampler.accept(this);
            }
            return steps;
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
        if (j != null) {
            for (Map<String, Object> e; (e = pendingEvents.poll()) != null; work++) {
                j.event(p.clock().epochMillis(), e);
            }
            j.flushIfDue();
        }
        if (sampler != null) {
            sampler.accept(this);
        }
        return work;
    }

    private void writeTruthIfDue(PlantRunJournal j) {
        double t = p.sim().timeS();
        if (t + p.sim().stepS() * 1e-6 < nextTruthS) {
            return;
        }
        nextTruthS += truthIntervalS * (Math.floor((t - nextTruthS) / truthIntervalS + 1e-9) + 1);
        Map<String, String> modes = new HashMap<>();
        for (UnitHost h : p.units()) {
            modes.put(h.unit().unitId(), h.unit().controlMode().wireName());
        }
        j.truth(epochMsAt(t), p.sim(), modes);
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
            ScenarioEvent e = events.get(nextEvent++);
            e.apply(this);
            if (record != null) {
                record.event(p.sim().timeS(), e.type(), e.toString());
            }
            PlantRunJournal j = journal;
            if (j != null) {
                j.event(epochMsAt(p.sim().timeS()), eventFields(e));
            }
        }
    }

    private static final com.fasterxml.jackson.databind.ObjectMapper EVENT_MAPPER =
            new com.fasterxml.jackson.databind.ObjectMapper();

    /** {@code {"event": type, "atS": …, …the event's own fields}}; falls back to its text form. */
    static Map<String, Object> eventFields(ScenarioEvent e) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("event", e.type());
        f.put("atS", e.atS());
        try {
            Map<?, ?> own = EVENT_MAPPER.convertValue(e, Map.class);
            own.forEach((k, v) -> {
                String name = String.valueOf(k);
                if (!f.containsKey(name) && !"t".equals(name) && !"kind".equals(name)) {
                    f.put(name, v);
                }
            });
        } catch (IllegalArgumentException ex) {
            f.put("detail", e.toString());
        }
        return f;
    }

    /** Decides the scenario's checks over the run record (only when the scenario ran to its end). */
    private void decideChecks(PlantRunJournal j) {
        if (record == null || checks.isEmpty()) {
            return;
        }
        if (!finished) {
            checkSink.accept("plant: scenario checks not decided: the run stopped at " + p.sim().timeS() + " s, before its end");
            return;
        }
        record.end(p.sim().timeS());
        for (CheckSpec c : checks) {
            CheckOutcome o;
            try {
                o = c.evaluate(record, p.sim().grid());
            } catch (RuntimeException e) {
                o = new CheckOutcome(c.name(), false, Double.NaN, "", Double.NaN,
                        "could not be decided: " + e.getMessage(), false);
            }
            checkSink.accept("plant: check " + o);
            if (j != null) {
                j.check(epochMsAt(p.sim().timeS()), o);
            }
        }
    }

    @Override
    public void onClose() {
        PlantRunJournal j = journal;
        decideChecks(j);
        if (j != null && !j.isClosed()) {
            for (Map<String, Object> e; (e = pendingEvents.poll()) != null; ) {
                j.event(p.clock().epochMillis(), e);
            }
            var h = p.lateness().histogramUs();
            j.event(p.clock().epochMillis(), Map.of("event", "summary", "simulatedS", p.sim().timeS(),
                    "steps", p.sim().stepCount(), "meterSent", meterSent, "meterDropped", meterDropped,
                    "stepLatenessP99Us", h.getValueAtPercentile(99), "stepLatenessMaxUs", h.getMaxValue()));
            j.close(Math.max(p.clock().epochMillis(), epochMsAt(p.sim().timeS())), finished ? EndReason.COMPLETED
                    : EndReason.STOPPED);
        }
    }

    private int scanMeters(long now) {
        int n = 0;
        for (AreaMeterPublisher m : p.meters()) {
            if (m.due(now)) {
                AreaMeter reading = m.scan(p.sim(), now, p.clock().epochMillis());
                n++;
                String topic = p.topics().areaMeter(reading.area(), reading.meter());
                byte[] payload = p.codec().encode(reading);
                PlantRunJournal j = journal;
                boolean connected = p.plantBus().isConnected();
                if (counters != null) {
                    counters.published("AreaMeter", connected, "notConnected");
                }
                if (!connected) {
                    meterDropped++; // never buffered: a late reading would pass for a fresh one
                    if (j != null) {
                        j.published(reading.sourceTime(), topic, "AreaMeter", reading.seq(), false, "notConnected", payload, null);
                    }
                    continue;
                }
                meterSent++;
                if (faults != null) {
                    faults.publishMeter(reading); // the fault stage decides what goes out
                    if (j != null) {
                        j.published(reading.sourceTime(), topic, "AreaMeter", reading.seq(), true, "throughFaultStage", payload, null);
                    }
                    continue;
                }
                p.plantBus().publish(OutboundMessage.of(topic, payload, Qos.AT_MOST_ONCE));
                if (j != null) {
                    j.published(reading.sourceTime(), topic, "AreaMeter", reading.seq(), true, null, payload, null);
                }
            }
        }
        return n;
    }

    private int publishClock(long now) {
        HeldStartClock held = p.clock() instanceof HeldStartClock h ? h : null;
        boolean running = held == null || held.running(); // held: the controller's time stands still too
        double rate = held == null ? p.rate() : held.currentRate();
        // published at every rate, 1 included: controllers take scenario time from it (docs/controller-contract.md)
        if (!p.plantBus().isConnected() || !clockTicks.due(now, running, rate)) {
            return 0;
        }
        ClockTick tick = new ClockTick(clockSeq++, p.clock().epochMillis(), Math.round(p.sim().timeS() * 1000), rate, running);
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
