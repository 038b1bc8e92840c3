package org.loopstand.controller.pulsetest.analysis;

import java.util.Objects;

/**
 * One judged figure: a row of the result table.
 *
 * @param step           step label, or {@code all steps} for figures over the whole test
 * @param figure         what was judged, e.g. {@code ramp rate}
 * @param passed         verdict
 * @param decidingFigure the measured figure with unit, e.g. {@code 17.6 MW/min}
 * @param limit          what it was held to, e.g. {@code 18.0 ± 15 % MW/min}
 * @param finding        on failure, what it means; null on a pass
 */
public record Judgement(String step, String figure, boolean passed, String decidingFigure, String limit,
        Finding finding) {
    public Judgement {
        Objects.requireNonNull(step, "step");
        Objects.requireNonNull(figure, "figure");
        finding = passed ? null : finding;
    }
}
