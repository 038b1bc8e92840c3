package org.loopstand.app.campaign;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.loopstand.plant.check.CheckOutcome;

/**
 * Makes a failing run smaller while the same check keeps failing, in the manner of property-based
 * testing: drop one drawn fault or load event, or narrow one fault's window (keep the first half, or the
 * second half); the first change under which the check still fails is kept and the search starts over.
 * It stops when no change keeps the failure or after {@code maxSteps} runs. The base scenario's own
 * events, faults and checks are never touched.
 */
final class Shrinker {
    private final RunExecutor executor;
    private final Path siteFile;
    private final ScenarioFiles files;
    private final CampaignSpec.Shrink bounds;

    Shrinker(RunExecutor executor, Path siteFile, ScenarioFiles files, CampaignSpec.Shrink bounds) {
        this.executor = executor;
        this.siteFile = siteFile;
        this.files = files;
        this.bounds = bounds;
    }

    /**
     * @param failing a failing run
     * @param dir     where the smallest combination's scenario file goes
     */
    RunResult.Shrunk shrink(RunResult failing, Path dir) {
        String check = failing.failingChecks().get(0);
        RunPlan current = failing.plan();
        CheckOutcome outcome = failing.checks().stream().filter(c -> c.name().equals(check)).findFirst().orElseThrow();
        String name = String.format(java.util.Locale.ROOT, "run-%04d", current.index());
        Path trial = dir.resolve(name + "-trying.yaml");
        Path smallest = dir.resolve(name + "-smallest.yaml");
        List<String> steps = new ArrayList<>();
        int tried = 0;
        boolean progress = true;
        while (progress && tried < bounds.maxSteps()) {
            progress = false;
            for (Candidate c : candidates(current)) {
                if (tried >= bounds.maxSteps()) {
                    break;
                }
                tried++;
                files.write(c.plan(), trial, "shrinking run " + current.index() + ": " + c.step());
                Optional<CheckOutcome> stillFails = failure(trial, check);
                if (stillFails.isPresent()) {
                    current = c.plan();
                    outcome = stillFails.get();
                    steps.add(c.step());
                    progress = true;
                    break;
                }
            }
        }
        files.write(current, smallest, "smallest failing combination found from run " + current.index() + " (check " + check
                + " fails), after " + tried + " shrink runs");
        try {
            Files.deleteIfExists(trial);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return new RunResult.Shrunk(current.index(), check, current, smallest, tried, steps, outcome);
    }

    private Optional<CheckOutcome> failure(Path scenario, String check) {
        try {
            return executor.checks(siteFile, scenario).stream().filter(c -> c.name().equals(check) && !c.passed()).findFirst();
        } catch (Exception | StackOverflowError e) {
            // a change that makes the run throw does not keep the same failure
            return Optional.empty();
        }
    }

    private record Candidate(RunPlan plan, String step) {
    }

    /** Smaller plans, biggest cuts first: drop a fault, drop a load event, then halve a window. */
    private List<Candidate> candidates(RunPlan plan) {
        List<Candidate> out = new ArrayList<>();
        for (int i = 0; i < plan.faults().size(); i++) {
            List<RunPlan.PlannedFault> fewer = new ArrayList<>(plan.faults());
            RunPlan.PlannedFault dropped = fewer.remove(i);
            out.add(new Candidate(plan.withFaults(fewer), "dropped " + dropped.describe()));
        }
        for (int i = 0; i < plan.loads().size(); i++) {
            List<RunPlan.PlannedLoad> fewer = new ArrayList<>(plan.loads());
            RunPlan.PlannedLoad dropped = fewer.remove(i);
            out.add(new Candidate(plan.withLoads(fewer), "dropped " + dropped.describe()));
        }
        for (int i = 0; i < plan.faults().size(); i++) {
            RunPlan.PlannedFault f = plan.faults().get(i);
            double half = Math.round(f.lengthS() / 2 * 1000.0) / 1000.0;
            if (half < bounds.minWindowS()) {
                continue;
            }
            double mid = f.startS() + half;
            out.add(new Candidate(plan.withFault(i, x -> x.window(x.startS(), mid)),
                    "narrowed " + f.type() + " on " + f.target() + " to [" + Distribution.format(f.startS()) + ", "
                            + Distribution.format(mid) + ") s (first half)"));
            out.add(new Candidate(plan.withFault(i, x -> x.window(mid, x.endS())),
                    "narrowed " + f.type() + " on " + f.target() + " to [" + Distribution.format(mid) + ", "
                            + Distribution.format(f.endS()) + ") s (start moved later)"));
        }
        return out;
    }
}
