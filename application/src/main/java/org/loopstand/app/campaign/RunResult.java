package org.loopstand.app.campaign;

import java.nio.file.Path;
import java.util.List;

import org.loopstand.plant.check.CheckOutcome;

/**
 * How one run of a campaign came out.
 *
 * @param plan         what was drawn for it
 * @param scenarioFile the scenario file it ran from (in the campaign folder)
 * @param checks       its checks (empty when it threw)
 * @param error        the stack trace when the run threw, else null
 */
public record RunResult(RunPlan plan, Path scenarioFile, List<CheckOutcome> checks, String error) {
    public RunResult {
        checks = List.copyOf(checks);
    }

    public enum Status { PASS, FAIL, ERROR }

    public Status status() {
        if (error != null) {
            return Status.ERROR;
        }
        return checks.stream().allMatch(CheckOutcome::passed) ? Status.PASS : Status.FAIL;
    }

    /** @return the names of the checks that failed, in the scenario's order */
    public List<String> failingChecks() {
        return checks.stream().filter(c -> !c.passed()).map(CheckOutcome::name).toList();
    }

    /**
     * A failing run made smaller while the same check still fails ({@link Shrinker}).
     *
     * @param runIndex     the run it started from
     * @param check        the check that fails throughout
     * @param smallest     the smallest failing combination found
     * @param scenarioFile its scenario file
     * @param runsTried    runs made while shrinking (bounded by the campaign's shrink.maxSteps)
     * @param steps        each accepted step, for people
     * @param outcome      the check's outcome in the smallest combination
     */
    public record Shrunk(int runIndex, String check, RunPlan smallest, Path scenarioFile, int runsTried, List<String> steps,
                         CheckOutcome outcome) {
        public Shrunk {
            steps = List.copyOf(steps);
        }
    }
}
