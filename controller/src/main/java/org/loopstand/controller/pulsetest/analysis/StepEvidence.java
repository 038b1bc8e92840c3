package org.loopstand.controller.pulsetest.analysis;

import java.util.List;

/**
 * Everything the judge weighs for one step.
 *
 * @param window               the step
 * @param measurement          its figures from the unit's own output (the governor's answer to frequency
 *                             removed when the unit's droop is known); these are judged
 * @param asMeasured           the same figures from the output as measured, shown beside them
 * @param expectedRampMwPerMin ramp the unit should achieve, MW/min (0 for a hold)
 * @param expectedMoveS        expected time from first pulse until the output arrives, s
 * @param refusals             commands of this step the unit refused
 * @param unanswered           commands of this step with no answer by the end of the step
 * @param settleWaitS          how long the step waited beyond its planned window for the unit to settle, s
 * @param settled              the unit had settled when the step ended (false: the wait timed out)
 */
public record StepEvidence(StepWindow window, StepMeasurement measurement, StepMeasurement asMeasured,
        double expectedRampMwPerMin, double expectedMoveS, List<Refusal> refusals, int unanswered, double settleWaitS,
        boolean settled) {
    public StepEvidence {
        refusals = List.copyOf(refusals);
    }
}
