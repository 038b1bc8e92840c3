package org.loopstand.controller.pulsetest.analysis;

import java.util.Objects;

/**
 * One judged figure: a row of the result table.
 *
 * @param step           step label, or {@code all steps} for figures over the whole test
 * @param figure         what was judged, e.g. {@code ramp rate}
 * @param passed         verdict: true only for a measured figure within its limit
 * @param measured       the figure could be measured; a row that was not measured never passes and
 *                       leads to no finding (its deciding figure says "not measured")
 * @param decidingFigure the measured figure with unit, e.g. {@code 17.6 MW/min}
 * @param limit          what it was held to, e.g. {@code 18.0 ± 15 % MW/min}
 * @param finding        on failure, what it means; null on a pass
 */
public record Judgement(String step, String figure, boolean passed, boolean measured, String decidingFigure,
        String limit, Finding finding) {
    public Judgement {
        Objects.requireNonNull(step, "step");
        Objects.requireNonNull(figure, "figure");
        passed = passed && measured;
        finding = passed || !measured ? null : finding;
    }

    /** A row whose figure could not be measured: never a pass, no finding. */
    public static Judgement notMeasured(String step, String figure, String limit) {
        return new Judgement(step, figure, false, false, NOT_MEASURED, limit, null);
    }

    /** Shown for a figure that could not be measured. */
    public static final String NOT_MEASURED = "not measured";

    /** @return PASS, FAIL or NOT MEASURED */
    public String outcome() {
        return passed ? "PASS" : measured ? "FAIL" : "NOT MEASURED";
    }
}
