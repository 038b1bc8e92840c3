package org.loopstand.controller.pulsetest;

import java.util.List;
import org.loopstand.controller.pulsetest.analysis.Finding;
import org.loopstand.controller.pulsetest.analysis.Judgement;

/**
 * The judged outcome of a run.
 *
 * @param record   what was recorded
 * @param steps    the steps measured (completed ones only when the run was aborted)
 * @param rows     the result table
 * @param findings distinct findings of the failed rows
 * @param verdict  overall verdict
 */
public record PulseTestResult(PulseTestRecord record, List<StepResult> steps, List<Judgement> rows,
        List<Finding> findings, Verdict verdict) {
    /** Overall verdict. */
    public enum Verdict {
        /** Every row passed and the whole programme ran. */
        PASS,
        /** The whole programme ran and at least one row failed. */
        FAIL,
        /** Stopped part-way: never a pass. */
        ABORTED,
        /** Never started. */
        REFUSED
    }

    public PulseTestResult {
        steps = List.copyOf(steps);
        rows = List.copyOf(rows);
        findings = List.copyOf(findings);
    }
}
