package org.loopstand.plant.engine;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.scenario.PlantControls;
import org.loopstand.plant.scenario.ScenarioContext;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.VirtualClock;

/**
 * The one scenario loop: fires the events that are due, updates the fault windows, steps the physics,
 * samples the truth into the run record, ends the run and decides its checks. Every way of running a
 * scenario drives this class and nothing else steps a scenario:
 * <ul>
 *   <li>the real-time plant calls {@link #catchUp} each cycle: it steps as far as the injected clock
 *       says is due (at most a given number of steps per call);</li>
 *   <li>the lockstep rehearsal and the physics-only study call {@link #runToEnd}: one step, then the
 *       {@link VirtualClock} moves one step, then the caller's participants run.</li>
 * </ul>
 * Events fire at the first step boundary at or after their time. Simulated time 0 is the clock's
 * reading when the engine is built. Single-threaded: one loop owns it.
 */
public final class ScenarioEngine implements ScenarioContext {
    /** What a driver does around each physics step. */
    public interface StepHook {
        /**
         * After the physics step (and, in lockstep, the clock's move), before the truth sample.
         *
         * @param latenessNanos how late the step ran behind the clock, ns (0 in lockstep)
         */
        default void stepped(long latenessNanos) {
        }

        /** After the truth sample. */
        default void sampled() {
        }
    }

    /** Told about every event as it fires. */
    public interface EventListener {
        /** @param timeS simulated time the event fired at, s */
        void fired(double timeS, ScenarioEvent event);
    }

    private final GridSimulator sim;
    private final Clock clock;
    private final List<ScenarioEvent> events;
    private final long startNanos;
    private final long stepNanos;
    private final List<EventListener> listeners = new ArrayList<>();
    private int nextEvent;
    private long endStep = Long.MAX_VALUE;
    private volatile boolean ended;
    private FaultEngine faults;
    private PlantControls plant;
    private RunRecord record;
    private double sampleIntervalS = 1.0;
    private double nextSampleS;
    private boolean started;

    /**
     * @param sim    the physics (owned by the driving loop from now on)
     * @param clock  the clock that says when steps are due; a {@link VirtualClock} in lockstep
     * @param events scenario events in time order, may be empty
     */
    public ScenarioEngine(GridSimulator sim, Clock clock, List<ScenarioEvent> events) {
        this.sim = sim;
        this.clock = clock;
        this.events = List.copyOf(events);
        this.startNanos = clock.monotonicNanos();
        this.stepNanos = Math.round(sim.stepS() * 1e9);
    }

    /**
     * Ends the scenario at {@code endAtS} of simulated time: the last step is the one nearest to it
     * (rounded to whole steps), then {@link #ended()}.
     *
     * @param endAtS simulated end time, s, &gt; 0
     */
    public ScenarioEngine endAt(double endAtS) {
        if (!(endAtS > 0)) {
            throw new IllegalArgumentException("endAtS must be positive, got " + endAtS);
        }
        this.endStep = Math.round(endAtS / sim.stepS());
        return this;
    }

    /** Fault windows open and close before each step at the clock's time. */
    public ScenarioEngine withFaults(FaultEngine faultWindows) {
        this.faults = faultWindows;
        return this;
    }

    /**
     * Keeps {@code r}: every fired event, every schedule change, and the truth at the start and then
     * every {@code sampleIntervalS} of simulated time.
     *
     * @param sampleIntervalS truth sample period, s, &gt; 0 (best a multiple of the step)
     */
    public ScenarioEngine recordInto(RunRecord r, double sampleIntervalS) {
        if (!(sampleIntervalS > 0)) {
            throw new IllegalArgumentException("sampleIntervalS must be positive, got " + sampleIntervalS);
        }
        this.record = r;
        this.sampleIntervalS = sampleIntervalS;
        this.nextSampleS = sim.timeS();
        return this;
    }

    /** Tells {@code l} about every event as it fires. */
    public ScenarioEngine listen(EventListener l) {
        listeners.add(l);
        return this;
    }

    /** Plant events (schedule, control mode) act on {@code controls}; null: the run has no plant on a bus. */
    public void plantControls(PlantControls controls) {
        this.plant = controls;
    }

    @Override
    public GridSimulator grid() {
        return sim;
    }

    @Override
    public PlantControls plant() {
        return plant;
    }

    @Override
    public void scheduleChanged(String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
        if (record != null) {
            record.scheduleChanged(sim.timeS(), area, scheduledNetInterchangeMw, scheduledFrequencyHz);
        }
    }

    /** @return true once the end time was reached (no further step will be taken) */
    public boolean ended() {
        return ended;
    }

    /** @return how many scenario events have fired */
    public int eventsFired() {
        return nextEvent;
    }

    /** @return the physics step, ns */
    public long stepNanos() {
        return stepNanos;
    }

    /** @return the time the physics has reached on the engine's clock scale: its start reading + steps × step, ns */
    public long physicsClockNanos() {
        return startNanos + sim.stepCount() * stepNanos;
    }

    /** @return the run record, or null when none is kept */
    public RunRecord record() {
        return record;
    }

    /**
     * Real time: takes every step the clock says is due, at most {@code maxSteps}; the rest next call.
     * A step due at or after the end time is not taken: the run has ended.
     *
     * @return steps taken
     */
    public int catchUp(int maxSteps, StepHook hook) {
        long now = clock.monotonicNanos();
        int steps = 0;
        while (steps < maxSteps && !ended) {
            long due = startNanos + (sim.stepCount() + 1) * stepNanos;
            if (now < due) {
                break;
            }
            if (sim.stepCount() >= endStep) {
                ended = true;
                break;
            }
            step(hook, now - due, null);
            steps++;
            now = clock.monotonicNanos();
        }
        return steps;
    }

    /**
     * Lockstep: runs the scenario to its end time (set by {@link #endAt}); after each physics step the
     * engine's clock moves one step, then {@code hook} runs. The fault windows are updated once more at
     * the end.
     *
     * @param clock the engine's clock
     */
    public void runToEnd(VirtualClock clock, StepHook hook) {
        if (clock != this.clock) {
            throw new IllegalArgumentException("runToEnd must move the engine's own clock");
        }
        if (endStep == Long.MAX_VALUE) {
            throw new IllegalStateException("runToEnd needs an end time (endAt)");
        }
        while (sim.stepCount() < endStep) {
            step(hook, 0, clock);
        }
        if (faults != null) {
            faults.update();
        }
        ended = true;
    }

    private void step(StepHook hook, long latenessNanos, VirtualClock lockstep) {
        if (!started) {
            started = true;
            sampleIfDue();
        }
        double tolerance = sim.stepS() * 1e-6;
        while (nextEvent < events.size() && events.get(nextEvent).atS() <= sim.timeS() + tolerance) {
            ScenarioEvent e = events.get(nextEvent++);
            e.apply(this);
            if (record != null) {
                record.event(sim.timeS(), e.type(), e.toString());
            }
            for (EventListener l : listeners) {
                l.fired(sim.timeS(), e);
            }
        }
        if (faults != null) {
            faults.update();
        }
        sim.step();
        if (lockstep != null) {
            lockstep.advanceNanos(stepNanos);
        }
        hook.stepped(latenessNanos);
        sampleIfDue();
        hook.sampled();
    }

    private void sampleIfDue() {
        if (record == null) {
            return;
        }
        double t = sim.timeS();
        if (t + sim.stepS() * 1e-6 < nextSampleS) {
            return;
        }
        record.sampleTruth(t, sim);
        nextSampleS += sampleIntervalS * (Math.floor((t - nextSampleS) / sampleIntervalS + 1e-9) + 1);
    }

    /**
     * Ends the run record at the current time and decides {@code checks} over it; a check that throws
     * is reported as not passed, "could not be decided".
     */
    public List<CheckOutcome> decideChecks(List<CheckSpec> checks) {
        if (record == null) {
            throw new IllegalStateException("checks need a run record (recordInto)");
        }
        record.end(sim.timeS());
        List<CheckOutcome> outcomes = new ArrayList<>();
        for (CheckSpec c : checks) {
            CheckOutcome o;
            try {
                o = c.evaluate(record, sim.grid());
            } catch (RuntimeException e) {
                o = new CheckOutcome(c.name(), false, Double.NaN, "", Double.NaN,
                        "could not be decided: " + e.getMessage(), false);
            }
            outcomes.add(o);
        }
        return outcomes;
    }
}
