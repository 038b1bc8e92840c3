package org.loopstand.app.campaign;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CompletionService;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorCompletionService;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.ThreadFactory;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Consumer;

import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.protocol.time.Clock;

/**
 * Runs a campaign's runs on a pool of worker threads, each run from its own scenario file with its own
 * plant, controller, bus and clock (nothing mutable is shared between runs), tells progress as runs
 * finish, then shrinks the first failing runs on the same pool. A run that throws is recorded with its
 * stack trace and the campaign goes on.
 */
public final class CampaignRunner {
    /** Shortest wall time between two progress lines, ms (the last line always comes). */
    static final long PROGRESS_EVERY_MS = 2000;

    private final CampaignSpec spec;
    private final List<RunPlan> plans;
    private final RunExecutor executor;
    private final int workers;
    private final Clock wall;
    private final Consumer<String> progress;

    /**
     * @param plans    the expanded runs ({@link CampaignExpander})
     * @param workers  worker threads, ≥ 1
     * @param wall     for the progress line's ETA and the campaign's wall time only
     * @param progress receives progress lines
     */
    public CampaignRunner(CampaignSpec spec, List<RunPlan> plans, RunExecutor executor, int workers, Clock wall,
            Consumer<String> progress) {
        if (workers < 1) {
            throw new IllegalArgumentException("workers must be >= 1, got " + workers);
        }
        this.spec = spec;
        this.plans = List.copyOf(plans);
        this.executor = executor;
        this.workers = workers;
        this.wall = wall;
        this.progress = progress;
    }

    /** What came out, runs in run order. */
    public record Result(CampaignSpec spec, Path folder, int workers, List<RunResult> runs, List<RunResult.Shrunk> shrunk,
                         long wallMs, long shrinkWallMs) {
        public long count(RunResult.Status s) {
            return runs.stream().filter(r -> r.status() == s).count();
        }
    }

    /**
     * @param folder the campaign folder (exists); run scenarios go to {@code scenarios/}, shrunk ones to {@code shrunk/}
     * @param shrink false: report failing runs without shrinking them
     */
    public Result run(Path folder, boolean shrink) throws InterruptedException {
        long started = wall.epochMillis();
        ScenarioFiles files = new ScenarioFiles(spec.scenarioFile(), List.of(
                "Scenario of a run of campaign " + spec.name() + " (" + spec.file() + ", master seed " + spec.masterSeed() + "):",
                "the base scenario " + spec.scenarioFile() + " with this run's random seed and its drawn faults and load events."));
        ExecutorService pool = Executors.newFixedThreadPool(workers, daemonThreads());
        try {
            CompletionService<RunResult> done = new ExecutorCompletionService<>(pool);
            for (RunPlan p : plans) {
                Path file = folder.resolve("scenarios").resolve(String.format(Locale.ROOT, "run-%04d.yaml", p.index()));
                files.write(p, file, "run " + p.index() + " of " + spec.runs() + ", random seed " + p.seed());
                done.submit(() -> runOne(p, file));
            }
            List<RunResult> results = new ArrayList<>();
            long lastLine = Long.MIN_VALUE;
            for (int i = 0; i < plans.size(); i++) {
                results.add(take(done));
                long now = wall.epochMillis();
                if (i == plans.size() - 1 || now - lastLine >= PROGRESS_EVERY_MS) {
                    progress.accept(progressLine(results, now - started));
                    lastLine = now;
                }
            }
            results.sort(Comparator.comparingInt(r -> r.plan().index()));
            long runsDone = wall.epochMillis();
            List<RunResult.Shrunk> shrunk = shrink ? shrinkAll(results, files, folder.resolve("shrunk"), pool) : List.of();
            long end = wall.epochMillis();
            return new Result(spec, folder, workers, results, shrunk, runsDone - started, end - runsDone);
        } finally {
            pool.shutdownNow();
        }
    }

    private RunResult runOne(RunPlan p, Path file) {
        try {
            return new RunResult(p, file, executor.checks(spec.siteFile(), file), null);
        } catch (Exception | StackOverflowError | OutOfMemoryError e) {
            return new RunResult(p, file, List.of(), stackTrace(e));
        }
    }

    private List<RunResult.Shrunk> shrinkAll(List<RunResult> results, ScenarioFiles files, Path dir, ExecutorService pool)
            throws InterruptedException {
        List<RunResult> failing = results.stream().filter(r -> r.status() == RunResult.Status.FAIL).limit(spec.shrink().maxRuns()).toList();
        if (failing.isEmpty() || spec.shrink().maxSteps() == 0) {
            return List.of();
        }
        progress.accept("campaign: shrinking " + failing.size() + " failing run" + (failing.size() == 1 ? "" : "s")
                + " (at most " + spec.shrink().maxSteps() + " runs each)");
        Shrinker shrinker = new Shrinker(executor, spec.siteFile(), files, spec.shrink());
        CompletionService<RunResult.Shrunk> done = new ExecutorCompletionService<>(pool);
        failing.forEach(r -> done.submit(() -> shrinker.shrink(r, dir)));
        List<RunResult.Shrunk> out = new ArrayList<>();
        for (int i = 0; i < failing.size(); i++) {
            out.add(take(done));
        }
        out.sort(Comparator.comparingInt(RunResult.Shrunk::runIndex));
        return out;
    }

    private static <T> T take(CompletionService<T> done) throws InterruptedException {
        try {
            return done.take().get();
        } catch (ExecutionException e) {
            // runOne and shrink catch what a run throws; anything else is a fault of the campaign itself
            throw new IllegalStateException("campaign worker failed: " + e.getCause(), e.getCause());
        }
    }

    private String progressLine(List<RunResult> results, long elapsedMs) {
        int n = results.size();
        long failing = results.stream().filter(r -> r.status() == RunResult.Status.FAIL).count();
        long errors = results.stream().filter(r -> r.status() == RunResult.Status.ERROR).count();
        long etaS = Math.round(elapsedMs / 1000.0 / n * (plans.size() - n));
        return String.format(Locale.ROOT, "campaign: %d/%d runs done, %d failing, %d error%s, %s", n, plans.size(), failing,
                errors, errors == 1 ? "" : "s", n == plans.size() ? "took " + (elapsedMs / 1000) + " s" : "ETA " + etaS + " s");
    }

    static String stackTrace(Throwable e) {
        StringWriter w = new StringWriter();
        e.printStackTrace(new PrintWriter(w));
        return w.toString();
    }

    private static ThreadFactory daemonThreads() {
        AtomicInteger n = new AtomicInteger();
        return r -> {
            Thread t = new Thread(r, "campaign-run-" + n.incrementAndGet());
            t.setDaemon(true);
            return t;
        };
    }

    /** @return the outcome of check {@code name} in {@code run}, if it has one */
    static java.util.Optional<CheckOutcome> outcome(RunResult run, String name) {
        return run.checks().stream().filter(c -> c.name().equals(name)).findFirst();
    }
}
