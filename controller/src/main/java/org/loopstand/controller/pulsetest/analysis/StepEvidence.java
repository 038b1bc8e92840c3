package org.loopstand.controller.pulsetest.analysis;

import java.util.List;

/**
 * Everything the judge weighs for one step.
 *
 * @param window               the step
 * @param measurement          its measured figures
 * @param expectedRampMwPerMin ramp the unit should achieve, MW/min (0 for a hold)
 * @param expectedMoveS        expected time from first pulse until the output arrives, s
 * @param refusals             commands of this step the unit refused
 * @param unanswered           commands of this step with no answer by the end of the step
 */
public record StepEvidence(StepWindow window, StepMeasurement measurement, double expectedRampMwPerMin,
        double expectedMoveS, List<Refusal> refusals, int unanswered) {
    public StepEvidence {
        refusals = List.copyOf(refusals);
    }
}
