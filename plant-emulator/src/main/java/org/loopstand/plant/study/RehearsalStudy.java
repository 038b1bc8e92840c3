package org.loopstand.plant.study;

import java.util.ArrayList;
import java.util.List;
import java.util.function.Function;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.ScenarioContext;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Runs a rehearsal scenario in study mode (lockstep on a virtual clock): physics, scenario events,
 * fault windows and, after every physics step, the participants the caller plugs in (the plant on the
 * bus, a controller, an in-memory broker's delivery); then evaluates the scenario's checks over the
 * run record. With no participants it is the physics alone: the checks then show what the grid does
 * without secondary control.
 */
public final class RehearsalStudy implements ScenarioContext {
    /** Scenario time of t = 0 in study runs, epoch ms (2026-01-01T00:00:00Z). */
    public static final long START_EPOCH_MS = 1_767_225_600_000L;

    /** What participants are built from. */
    public record Context(Grid grid, GridSimulator sim, VirtualClock clock, FaultEngine faults, RunRecord record,
                          RunScenario scenario) {
    }

    /** The checks' verdicts and the record they were read from. */
    public record Result(List<CheckOutcome> outcomes, RunRecord record) {
        public boolean allPassed() {
            return outcomes.stream().allMatch(CheckOutcome::passed);
        }

        public CheckOutcome outcome(String checkName) {
            return outcomes.stream().filter(o -> o.name().equals(checkName)).findFirst()
                    .orElseThrow(() -> new IllegalArgumentException("no check '" + checkName + "'"));
        }
    }

    private final Grid grid;
    private final RunScenario scenario;
    private final GridSimulator sim;
    private final VirtualClock clock = new VirtualClock(START_EPOCH_MS);
    private final RunRecord record = new RunRecord(START_EPOCH_MS);
    private final FaultEngine faults;
    private final List<Agent> participants;
    private final double sampleIntervalS;

    /**
     * @param sampleIntervalS how often the truth is sampled into the record, s (a multiple of the step)
     * @param participants    builds the agents to run after each physics step; may return an empty list
     * @param extraObserver   told about every fault transition and publication besides the record (a journal), may be NONE
     */
    public RehearsalStudy(Grid grid, RunScenario scenario, double sampleIntervalS, Function<Context, List<Agent>> participants,
            FaultObserver extraObserver) {
        this.grid = grid;
        this.scenario = scenario;
        var s = scenario.scenario();
        double stepS = Double.isNaN(s.stepS()) ? new StepSizeRule(grid).defaultStepS() : s.stepS();
        this.sim = new GridSimulator(grid, stepS, s.seed(), s.startHourOfDay());
        this.sampleIntervalS = sampleIntervalS;
        this.faults = new FaultEngine(clock, START_EPOCH_MS, FaultObserver.all(List.of(record, extraObserver)));
        for (FaultSpec f : scenario.faults()) {
            faults.schedule(f).ifPresent(why -> {
                throw new IllegalArgumentException("fault " + f.id() + ": " + why);
            });
        }
        this.participants = List.copyOf(participants.apply(new Context(grid, sim, clock, faults, record, scenario)));
    }

    @Override
    public GridSimulator grid() {
        return sim;
    }

    public FaultEngine faults() {
        return faults;
    }

    public RunRecord record() {
        return record;
    }

    /** Runs the scenario to its end and evaluates its checks. */
    public Result run() {
        double stepS = sim.stepS();
        long stepNanos = Math.round(stepS * 1e9);
        long totalSteps = Math.round(scenario.scenario().durationS() / stepS);
        long sampleEvery = Math.max(1, Math.round(sampleIntervalS / stepS));
        List<ScenarioEvent> events = scenario.scenario().events();
        participants.forEach(Agent::onStart);
        int next = 0;
        double tolerance = stepS * 1e-6;
        record.sampleTruth(0, sim);
        for (long k = 0; k < totalSteps; k++) {
            while (next < events.size() && events.get(next).atS() <= sim.timeS() + tolerance) {
                ScenarioEvent e = events.get(next++);
                e.apply(this);
                record.event(sim.timeS(), e.type(), e.toString());
            }
            faults.update();
            sim.step();
            clock.advanceNanos(stepNanos);
            for (Agent a : participants) {
                a.doWork();
            }
            if ((k + 1) % sampleEvery == 0) {
                record.sampleTruth(sim.timeS(), sim);
            }
        }
        faults.update();
        participants.forEach(Agent::onClose);
        record.end(sim.timeS());
        List<CheckOutcome> outcomes = new ArrayList<>();
        for (CheckSpec c : scenario.checks()) {
            outcomes.add(c.evaluate(record, grid));
        }
        return new Result(outcomes, record);
    }
}
