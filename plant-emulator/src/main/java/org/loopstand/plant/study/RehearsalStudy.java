package org.loopstand.plant.study;

import java.util.List;
import java.util.function.Function;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.engine.ScenarioEngine;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.codec.RecentEncodings;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Runs a rehearsal scenario in study mode (lockstep on a virtual clock): the {@link ScenarioEngine}
 * fires the events, updates the fault windows and steps the physics; after every step the
 * participants the caller plugs in run (the plant on the bus, a controller, an in-memory broker's
 * delivery); then the scenario's checks are decided over the run record. With no participants it is
 * the physics alone: the checks then show what the grid does without secondary control.
 */
public final class RehearsalStudy {
    /** Scenario time of t = 0 in study runs, epoch ms (2026-01-01T00:00:00Z). */
    public static final long START_EPOCH_MS = 1_767_225_600_000L;

    /**
     * What participants are built from.
     *
     * @param engine the scenario loop that steps the physics: a participant that is the plant on the bus
     *               follows its steps and hands it the plant's controls, so that plant events
     *               (scheduleChange, modeChange) reach it
     */
    public record Context(Grid grid, GridSimulator sim, VirtualClock clock, FaultEngine faults, RunRecord record,
                          RunScenario scenario, ScenarioEngine engine) {
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

    private final RunScenario scenario;
    private final VirtualClock clock = new VirtualClock(START_EPOCH_MS);
    private final RunRecord record = new RunRecord(START_EPOCH_MS);
    private final FaultEngine faults;
    private final ScenarioEngine engine;
    private final List<Agent> participants;

    /**
     * @param sampleIntervalS how often the truth is sampled into the record, s (a multiple of the step)
     * @param participants    builds the agents to run after each physics step; may return an empty list
     * @param extraObserver   told about every fault transition and publication besides the record (a journal), may be NONE
     */
    public RehearsalStudy(Grid grid, RunScenario scenario, double sampleIntervalS, Function<Context, List<Agent>> participants,
            FaultObserver extraObserver) {
        this.scenario = scenario;
        var s = scenario.scenario();
        double stepS = Double.isNaN(s.stepS()) ? new StepSizeRule(grid).defaultStepS() : s.stepS();
        GridSimulator sim = new GridSimulator(grid, stepS, s.seed(), s.startHourOfDay(), s.integrator());
        this.faults = new FaultEngine(clock, START_EPOCH_MS, FaultObserver.all(List.of(record, extraObserver)));
        for (FaultSpec f : scenario.faults()) {
            faults.schedule(f).ifPresent(why -> {
                throw new IllegalArgumentException("fault " + f.id() + ": " + why);
            });
        }
        this.engine = new ScenarioEngine(sim, clock, s.events()).endAt(s.durationS()).withFaults(faults)
                .recordInto(record, sampleIntervalS);
        this.participants = List.copyOf(participants.apply(new Context(grid, sim, clock, faults, record, scenario,
                engine)));
    }

    public FaultEngine faults() {
        return faults;
    }

    public RunRecord record() {
        return record;
    }

    /** Runs the scenario to its end and evaluates its checks. */
    public Result run() {
        // Publisher and subscriber share this thread: a decode of bytes just encoded returns the
        // encoded record instead of parsing it again (docs/lockstep.md, "What the bus carries").
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            participants.forEach(Agent::onStart);
            engine.runToEnd(clock, new ScenarioEngine.StepHook() {
                @Override
                public void stepped(long latenessNanos) {
                    for (Agent a : participants) {
                        a.doWork();
                    }
                }
            });
            participants.forEach(Agent::onClose);
        }
        return new Result(engine.decideChecks(scenario.checks()), record);
    }
}
