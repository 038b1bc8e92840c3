package org.loopstand.plant.study;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.ScenarioContext;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Runs a scenario against the physics as fast as the CPU allows, on a {@link VirtualClock} that moves
 * one step at a time: no broker, no wall clock in the physics. The injected wall clock only measures
 * how long the run took. Events fire at the first step boundary at or after their time.
 */
public final class StudyRunner implements ScenarioContext {
    private final Grid grid;
    private final Scenario scenario;
    private final Clock wallClock;
    private final ProgressReporter progress;
    private final GridSimulator sim;
    private final VirtualClock virtualClock = new VirtualClock(0L);
    private final long stepNanos;
    private final long traceEverySteps;
    private final long totalSteps;

    public StudyRunner(Grid grid, Scenario scenario, Clock wallClock, ProgressReporter progress) {
        this.grid = grid;
        this.scenario = scenario;
        this.wallClock = wallClock;
        this.progress = progress;
        double stepS = Double.isNaN(scenario.stepS()) ? new StepSizeRule(grid).defaultStepS() : scenario.stepS();
        this.sim = new GridSimulator(grid, stepS, scenario.seed(), scenario.startHourOfDay());
        this.stepNanos = Math.round(stepS * 1e9);
        this.traceEverySteps = Math.round(scenario.traceIntervalS() / stepS);
        if (traceEverySteps < 1 || Math.abs(traceEverySteps * stepS - scenario.traceIntervalS()) > 1e-9) {
            throw new IllegalArgumentException("traceIntervalS " + scenario.traceIntervalS()
                    + " s must be a whole multiple of the step " + stepS + " s");
        }
        this.totalSteps = Math.round(scenario.durationS() / stepS);
    }

    @Override
    public GridSimulator grid() {
        return sim;
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
        List<ScenarioEvent> events = scenario.events();
        int next = 0;
        double tolerance = sim.stepS() * 1e-6;
        for (long k = 0; k < totalSteps; k++) {
            while (next < events.size() && events.get(next).atS() <= sim.timeS() + tolerance) {
                events.get(next++).apply(this);
            }
            sim.step();
            virtualClock.advanceNanos(stepNanos);
            for (int a = 0; a < areaCount; a++) {
                double f = sim.frequencyHz(a);
                minHz[a] = Math.min(minHz[a], f);
                maxHz[a] = Math.max(maxHz[a], f);
            }
            settling.observe(sim);
            if ((k + 1) % traceEverySteps == 0) {
                trace.write(sim);
            }
            if ((k & 255) == 0) {
                progress.update(sim.timeS(), scenario.durationS(), (wallClock.monotonicNanos() - wallStart) / 1e9);
            }
        }
        double wallS = (wallClock.monotonicNanos() - wallStart) / 1e9;
        progress.done(sim.timeS(), wallS);
        return result(minHz, maxHz, imbalanceMw, next, settling, wallS);
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
