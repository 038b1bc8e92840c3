package org.loopstand.controller.pulsetest;

import org.loopstand.controller.pulsetest.analysis.StepEvidence;

/**
 * One step as measured, with the absolute window it was judged over.
 *
 * @param index    programme step index
 * @param evidence window, measured figures, expected figures and refused commands
 */
public record StepResult(int index, StepEvidence evidence) {
}
