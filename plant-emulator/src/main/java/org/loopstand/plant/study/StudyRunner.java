package org.loopstand.plant.study;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.engine.ScenarioEngine;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Runs a scenario against the physics as fast as the CPU allows, on a {@link VirtualClock} that moves
 * one step at a time: no broker, no wall clock in the physics. The injected wall clock only measures
 * how long the run took. The {@link ScenarioEngine} steps the scenario (events at the first step
 * boundary at or after their time, fault windows, truth samples); a rehearsal scenario's checks are
 * decided over the physics alone and its rate is unused.
 */
public final class StudyRunner {
    private final Grid grid;
    private final Scenario scenario;
    private final RunScenario runScenario;
    private final Clock wallClock;
    private final ProgressReporter progress;
    private final GridSimulator sim;
    private final VirtualClock virtualClock = new VirtualClock(0L);
    private final long stepNanos;
    private final long traceEverySteps;
    private final long totalSteps;
    private final RunRecord record = new RunRecord(0L);
    private final ScenarioEngine engine;
    private List<CheckOutcome> checkOutcomes = List.of();

    public StudyRunner(Grid grid, Scenario scenario, Clock wallClock, ProgressReporter progress) {
        this(grid, new RunScenario(scenario, 1.0, List.of(), List.of()), wallClock, progress);
    }

    /** A rehearsal scenario: its faults open and close on the physics, its checks are decided at the end. */
    public StudyRunner(Grid grid, RunScenario runScenario, Clock wallClock, ProgressReporter progress) {
        this.grid = grid;
        this.runScenario = runScenario;
        this.scenario = runScenario.scenario();
        this.wallClock = wallClock;
        this.progress = progress;
        double stepS = Double.isNaN(scenario.stepS()) ? new StepSizeRule(grid).defaultStepS() : scenario.stepS();
        this.sim = new GridSimulator(grid, stepS, scenario.seed(), scenario.startHourOfDay(), scenario.integrator());
        this.stepNanos = Math.round(stepS * 1e9);
        this.traceEverySteps = Math.round(scenario.traceIntervalS() / stepS);
        if (traceEverySteps < 1 || Math.abs(traceEverySteps * stepS - scenario.traceIntervalS()) > 1e-9) {
            throw new IllegalArgumentException("traceIntervalS " + scenario.traceIntervalS()
                    + " s must be a whole multiple of the step " + stepS + " s");
        }
        this.totalSteps = Math.round(scenario.durationS() / stepS);
        FaultEngine faults = new FaultEngine(virtualClock, 0L, record);
        for (FaultSpec f : runScenario.faults()) {
            faults.schedule(f).ifPresent(why -> {
                throw new IllegalArgumentException("fault " + f.id() + ": " + why);
            });
        }
        this.engine = new ScenarioEngine(sim, virtualClock, scenario.events()).endAt(scenario.durationS())
                .withFaults(faults).recordInto(record, 1.0);
    }

    /** @return the physics */
    public GridSimulator grid() {
        return sim;
    }

    /** @return the scenario's checks decided over the physics alone (empty until {@link #run} returned) */
    public List<CheckOutcome> checkOutcomes() {
        return checkOutcomes;
    }

    /** @return the run's clock: scenario time, advanced one physics step at a time */
    public VirtualClock virtualClock() {
        return virtualClock;
    }

    /** Writes {@code outDir/trace.csv} and {@code outDir/summary.json}. */
    public StudyResult run(Path outDir) throws IOException {
        Files.createDirectories(outDir);
        StudyResult result;
        try (Writer trace = new BufferedWriter(Files.newBufferedWriter(outDir.resolve("trace.csv"),
                StandardCharsets.UTF_8), 1 << 16)) {
            result = run(trace);
        }
        try (Writer summary = Files.newBufferedWriter(outDir.resolve("summary.json"), StandardCharsets.UTF_8)) {
            SummaryWriter.write(summary, result);
        }
        return result;
    }

    /** Runs the whole scenario, writing the trace to {@code traceOut} (not closed). */
    public StudyResult run(Writer traceOut) throws IOException {
        long wallStart = wallClock.monotonicNanos();
        int areaCount = grid.areas().size();
        double[] minHz = new double[areaCount];
        double[] maxHz = new double[areaCount];
        double[] imbalanceMw = new double[areaCount];
        for (int a = 0; a < areaCount; a++) {
            minHz[a] = maxHz[a] = sim.frequencyHz(a);
            imbalanceMw[a] = sim.generationMw(a) - sim.loadMw(a) - sim.netInterchangeMw(a);
        }
        SettlingWatch settling = new SettlingWatch(areaCount, grid.ties().size(), totalSteps * sim.stepS());
        TraceWriter trace = new TraceWriter(traceOut, grid);
        trace.write(sim);
        long[] k = {0};
        try {
            engine.runToEnd(virtualClock, new ScenarioEngine.StepHook() {
                @Override
                public void stepped(long latenessNanos) {
                    for (int a = 0; a < areaCount; a++) {
                        double f = sim.frequencyHz(a);
                        minHz[a] = Math.min(minHz[a], f);
                        maxHz[a] = Math.max(maxHz[a], f);
                    }
                    settling.observe(sim);
                    if ((k[0] + 1) % traceEverySteps == 0) {
                        try {
                            trace.write(sim);
                        } catch (IOException e) {
                            throw new UncheckedIOException(e);
                        }
                    }
                    if ((k[0] & 255) == 0) {
                        progress.update(sim.timeS(), scenario.durationS(), (wallClock.monotonicNanos() - wallStart) / 1e9);
                    }
                    k[0]++;
                }
            });
        } catch (UncheckedIOException e) {
            throw e.getCause();
        }
        checkOutcomes = engine.decideChecks(runScenario.checks());
        double wallS = (wallClock.monotonicNanos() - wallStart) / 1e9;
        progress.done(sim.timeS(), wallS);
        return result(minHz, maxHz, imbalanceMw, engine.eventsFired(), settling, wallS);
    }

    private StudyResult result(double[] minHz, double[] maxHz, double[] imbalanceMw, int eventsApplied, SettlingWatch settling,
                               double wallS) {
        Map<String, Map<String, Double>> areas = new LinkedHashMap<>();
        for (int a = 0; a < grid.areas().size(); a++) {
            Map<String, Double> m = new LinkedHashMap<>();
            m.put("finalFrequencyHz", sim.frequencyHz(a));
            m.put("minFrequencyHz", minHz[a]);
            m.put("maxFrequencyHz", maxHz[a]);
            m.put("initialImbalanceMw", imbalanceMw[a]);
            areas.put(grid.areas().get(a).id(), m);
        }
        Map<String, Map<String, Double>> ties = new LinkedHashMap<>();
        for (int t = 0; t < grid.ties().size(); t++) {
            ties.put(grid.ties().get(t).id(), Map.of("finalFlowMw", sim.tieFlowMw(t)));
        }
        Map<String, Map<String, Double>> units = new LinkedHashMap<>();
        for (int u = 0; u < grid.units().size(); u++) {
            units.put(grid.units().get(u).id(), Map.of("finalOutputMw", sim.outputMw(u)));
        }
        return new StudyResult(grid.siteId(), scenario.seed(), sim.stepS(), sim.timeS(), eventsApplied,
                settling.settled(), settling.criterion(sim.timeS()), areas, ties, units, wallS);
    }
}
