package org.loopstand.plant.runtime;

import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.function.Consumer;

import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.engine.ScenarioEngine;
import org.loopstand.plant.field.FieldGateway;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.meter.AreaMeterPublisher;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.plant.scenario.PlantControls;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The plant's one loop: lets its {@link ScenarioEngine} step the scenario up to the clock's now (at
 * most {@value #MAX_STEPS_PER_CYCLE} steps per cycle, then the rest next cycle), lets every in-process
 * unit interface handle its queued commands and tick after each step, runs due meter scans
 * ({@link MeterScan}), serves the field topics of units that run elsewhere, applies operator orders
 * and publishes the scenario clock ({@link PlantClockPublisher}). All bus input
 * reaches it through bounded queues, so nothing on a bus thread can hold it up. In a lockstep study
 * the study's engine steps the physics and this agent only follows ({@link #followSteps}).
 *
 * <p>Simulated time 0 is the clock's reading when the agent is built (it sets the parts'
 * {@link PhysicsEpoch} to it). Meter readings carry the time of the physics state they were read from, not
 * the clock's: while the physics lags the clock they are as old as that state.
 */
public final class PlantAgent implements Agent {
    public static final int MAX_STEPS_PER_CYCLE = 250;

    /** What the agent runs. */
    public record Parts(GridSimulator sim, Clock clock, MessageBus plantBus, TopicTree topics, MessageCodec codec,
                        List<AreaMeterPublisher> meters, List<UnitDutyCycle> units, FieldGateway field,
                        OperatorOrders orders, List<ScenarioEvent> events, double rate, StepLateness lateness,
                        PhysicsEpoch physicsEpoch) {
    }

    private final Parts p;
    private final long stepNanos;
    private final BusPlantControls controls;
    private final PlantClockPublisher clockPublisher;
    private final MeterScan meterScan;
    private final PlantLoopJournal journal;
    private final ConcurrentLinkedQueue<Runnable> loopTasks = new ConcurrentLinkedQueue<>();
    private ScenarioEngine engine;
    /** False in a lockstep study: another loop steps the physics. */
    private boolean stepsPhysics = true;
    private PlantCheckVerdicts verdicts;
    private boolean closed;
    private FaultHooks faults;
    /** Steps between two passes over one unit interface (1 = every unit after every step). */
    private int unitSlices = 1;
    private Consumer<PlantAgent> sampler;
    private Runnable cycleWatcher;
    private int unitWork;
    /** told about each step's unit pass (a publisher that spreads the step's telemetry), or none */
    private StepPassMarks stepMarks = StepPassMarks.NONE;
    /** the physics step in wall time at the run's rate, ns */
    private final long wallStepNanos;
    /** the scenario clock the physics' time is told to after every step (its leash), or null */
    private final HeldStartClock leashed;

    private final ScenarioEngine.StepHook stepHook = new ScenarioEngine.StepHook() {
        @Override
        public void stepped(long latenessNanos) {
            if (leashed != null) {
                leashed.physicsAt(engine.physicsClockNanos()); // before the pace keeper looks at the step
            }
            p.lateness().record(latenessNanos);
            journal.stepped(latenessNanos);
        }

        @Override
        public void sampled() {
            stepMarks.stepPassBegins();
            unitWork += workUnits((int) (p.sim().stepCount() % unitSlices));
            stepMarks.stepPassEnds(wallStepNanos);
        }
    };

    public PlantAgent(Parts parts) {
        this.p = parts;
        // simulated time 0 = the clock's now, the instant the engine below counts its steps from
        parts.physicsEpoch().startAt(parts.clock().epochMillis());
        this.stepNanos = Math.round(parts.sim().stepS() * 1e9);
        this.wallStepNanos = parts.rate() > 0 ? Math.max(1, Math.round(stepNanos / parts.rate())) : stepNanos;
        this.controls = new BusPlantControls(parts.clock(), parts.physicsEpoch(), parts.plantBus(), parts.topics(),
                parts.codec(), parts.units());
        this.clockPublisher = new PlantClockPublisher(parts.clock(), parts.plantBus(), parts.topics(), parts.codec(),
                parts.rate());
        this.meterScan = new MeterScan(parts.meters(), parts.sim(), parts.physicsEpoch(), parts.clock(), parts.plantBus(),
                parts.topics(), parts.codec());
        this.journal = new PlantLoopJournal(parts.clock(), parts.sim(), parts.units(), this::epochMsAt);
        this.engine = new ScenarioEngine(parts.sim(), parts.clock(), parts.events()).listen(journal);
        engine.plantControls(controls);
        this.leashed = parts.clock() instanceof HeldStartClock h ? h : null;
        if (leashed != null) {
            leashed.physicsAt(engine.physicsClockNanos());
        }
    }

    /**
     * Journals the run from now on (call before the loop starts): physics truth every
     * {@code truthIntervalS} of scenario time, meter messages, scenario and process events, step
     * lateness. The agent closes the journal in {@link #onClose()}.
     */
    public void journalTo(PlantRunJournal j, double truthIntervalS) {
        journal.attach(j, truthIntervalS);
    }

    /** Ends the scenario at {@code endAtS} of simulated time: no step beyond it, then {@link #finished()}. */
    public void endAt(double endAtS) {
        engine.endAt(endAtS);
    }

    /** @return true once the scenario's end time was reached (the loop then publishes nothing more) */
    public boolean finished() {
        return engine.ended();
    }

    /**
     * Keeps a run record for the scenario's checks (call before the loop starts): truth sampled every
     * scenario second, scenario events; when the scenario ends the checks are decided, journaled as
     * {@code check} entries and each told to {@code sink} as one line.
     */
    public void checkWith(RunRecord r, List<CheckSpec> specs, Consumer<String> sink) {
        engine.recordInto(r, 1.0);
        this.verdicts = new PlantCheckVerdicts(specs, sink);
    }

    /**
     * Owner thread, before start (lockstep study): {@code lockstep} steps the physics; this agent runs
     * its units, meters, field and faults after each of its steps and hands it the plant's controls.
     */
    public void followSteps(ScenarioEngine lockstep) {
        this.engine = lockstep;
        this.stepsPhysics = false;
        lockstep.plantControls(controls);
    }

    /** Any thread: runs {@code task} on the loop's thread at its next cycle (e.g. feeding the run record). */
    public void runOnLoop(Runnable task) {
        loopTasks.add(task);
    }

    /** Any thread: queues a process event for the journal ({@code fields} holds {@code event}). */
    public void noteEvent(Map<String, Object> fields) {
        journal.note(fields);
    }

    /** @return scenario epoch ms of simulated time {@code timeS} (time 0 = the agent's start) */
    public long epochMsAt(double timeS) {
        return p.physicsEpoch().epochMsAt(timeS);
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

    /** Before start: {@code marks} is told when each step's unit pass begins and ends (loop thread). */
    public void markStepPasses(StepPassMarks marks) {
        this.stepMarks = marks;
    }

    /** Before start: {@code watcher} runs on the loop's thread after every cycle of a running scenario (cheap). */
    public void watchCycles(Runnable watcher) {
        this.cycleWatcher = watcher;
    }

    /** Before start: every meter message sent or dropped is counted into {@code c} as the journal records it. */
    public void countInto(PlantCounters c) {
        meterScan.countInto(c);
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
        if (stepsPhysics) {
            engine.withFaults(hooks.engine());
        }
    }

    /** @return the physics (loop thread only) */
    public GridSimulator grid() {
        return p.sim();
    }

    /** Scenario events (through the {@link ScenarioEngine}) reach the plant's units and the schedule topic through this. */
    public PlantControls plant() {
        return controls;
    }

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
        unitWork = 0;
        int steps = stepsPhysics ? engine.catchUp(MAX_STEPS_PER_CYCLE, stepHook) : 0;
        work += unitWork;
        if (stepsPhysics && engine.ended()) {
            // the scenario is over: physics, meters and units stand still; only the journal is kept flushed
            journal.flushIfDue();
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
        long now = p.clock().monotonicNanos();
        work += meterScan.scanDue(now, journal.journal(), faults);
        work += clockPublisher.publishIfDue(now, p.sim().timeS());
        work += journal.drainAndFlush();
        if (cycleWatcher != null) {
            cycleWatcher.run();
        }
        if (sampler != null) {
            sampler.accept(this);
        }
        return work;
    }

    /** Runs the unit interfaces of one slice: unit i belongs to slice i mod unitSlices. */
    private int workUnits(int slice) {
        int work = 0;
        List<UnitDutyCycle> units = p.units();
        for (int i = slice; i < units.size(); i += unitSlices) {
            work += units.get(i).work();
        }
        return work;
    }

    @Override
    public void onClose() {
        if (closed) {
            return; // a runner that was never started closes its agent itself: verdicts are told once
        }
        closed = true;
        PlantRunJournal j = journal.journal();
        if (verdicts != null) {
            verdicts.decide(engine, epochMsAt(p.sim().timeS()), j);
        }
        journal.close(p.lateness(), meterScan.sentCount(), meterScan.droppedCount(), engine.ended());
    }

    /** @return meter readings dropped because the plant link was down */
    public long meterDroppedCount() {
        return meterScan.droppedCount();
    }

    public long meterSentCount() {
        return meterScan.sentCount();
    }

    public Parts parts() {
        return p;
    }
}
