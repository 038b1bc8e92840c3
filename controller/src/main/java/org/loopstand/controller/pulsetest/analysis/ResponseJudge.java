package org.loopstand.controller.pulsetest.analysis;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Collectors;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.controller.pulsetest.plan.Tolerances;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;

/**
 * Judges measured steps against the unit's declared figures and the plan's tolerances. A finding is made
 * only from a measured figure; a figure that cannot be measured (NaN) gives a "not measured" row, which
 * never passes: absence of evidence is not a pass, nor is it evidence of a fault. Failures that follow
 * from a unit not moving, or moving the wrong way, carry that finding rather than a consequence of it.
 */
public final class ResponseJudge {
    private final Tolerances tol;
    private final double declaredGainMwPerPulseS;
    private final double noiseThresholdMw;

    /**
     * @param tolerances              from the plan
     * @param declaredGainMwPerPulseS declared pulse rate / 60, MW per pulse-second
     * @param noiseThresholdMw        movement threshold, MW
     */
    public ResponseJudge(Tolerances tolerances, double declaredGainMwPerPulseS, double noiseThresholdMw) {
        this.tol = tolerances;
        this.declaredGainMwPerPulseS = declaredGainMwPerPulseS;
        this.noiseThresholdMw = noiseThresholdMw;
    }

    /** @return the result rows: per step in order, then the whole-test figures */
    public List<Judgement> judge(List<StepEvidence> steps) {
        List<Judgement> rows = new ArrayList<>();
        for (StepEvidence e : steps) {
            judgeStep(e, rows);
        }
        asymmetry(steps, rows);
        return rows;
    }

    /** @return the distinct findings of the failed rows, in order of first appearance */
    public static List<Finding> findings(List<Judgement> rows) {
        return rows.stream().filter(r -> !r.passed() && r.measured()).map(Judgement::finding).distinct().toList();
    }

    private void judgeStep(StepEvidence e, List<Judgement> rows) {
        StepWindow w = e.window();
        StepMeasurement m = e.measurement();
        String s = w.label();
        if (w.kind() == StepKind.HOLD) {
            rows.add(max(s, "drift during hold", Math.abs(m.peakExcursionMw()), tol.holdDriftMaxMw(), "MW", 2,
                    Finding.DRIFT));
            return;
        }
        boolean opposite = m.opposite() || m.measuredChangeMw() * w.sign() < -noiseThresholdMw;
        boolean still = Math.abs(m.measuredChangeMw()) <= noiseThresholdMw
                && Math.abs(m.requestedChangeMw()) > noiseThresholdMw;
        Finding cause = opposite ? Finding.OPPOSITE_DIRECTION : still ? Finding.NO_MOVEMENT : null;
        if (w.kind() != StepKind.SHORT_PULSES && w.kind() != StepKind.REVERSAL) {
            boolean moved = m.measuredChangeMw() * w.sign() > noiseThresholdMw;
            String limit = "same direction, beyond " + fmt(noiseThresholdMw, 2, "MW");
            rows.add(Double.isNaN(m.measuredChangeMw()) ? Judgement.notMeasured(s, "movement", limit)
                    : new Judgement(s, "movement", moved && !opposite, true, fmt(m.measuredChangeMw(), 2, "MW")
                            + " for " + fmt(m.requestedChangeMw(), 2, "MW") + " asked", limit,
                            opposite ? Finding.OPPOSITE_DIRECTION : Finding.NO_MOVEMENT));
        }
        double gainTol = w.kind() == StepKind.SHORT_PULSES ? tol.shortPulseGainPct() : tol.gainPct();
        if (w.kind() != StepKind.REVERSAL) {
            rows.add(because(cause, within(s, "gain", m.gainMwPerPulseS(), declaredGainMwPerPulseS, gainTol,
                    "MW/pulse-s", 3, Finding.GAIN_LOW, Finding.GAIN_HIGH)));
        }
        if (w.kind() == StepKind.STAIRCASE || w.kind() == StepKind.RAMP_TO_LIMIT) {
            rows.add(max(s, "dead time", m.deadTimeS(), tol.deadTimeMaxS(), "s", 1, Finding.DEAD_TIME_LONG));
            rows.add(within(s, "ramp rate", m.rampMwPerMin(), e.expectedRampMwPerMin(), tol.rampPct(), "MW/min", 2,
                    Finding.RAMP_TOO_SLOW, Finding.RAMP_TOO_FAST));
            rows.add(max(s, "overshoot", m.overshootPct(), tol.overshootMaxPct(), "%", 1, Finding.OVERSHOOT));
            rows.add(max(s, "settling time", m.settlingTimeS(), e.expectedMoveS() + tol.settlingAllowanceS(), "s", 1,
                    Finding.SLOW_SETTLING));
        }
        if (w.kind() == StepKind.REVERSAL) {
            rows.add(max(s, "turn-round delay", m.turnDelayS(), tol.deadTimeMaxS(), "s", 1, Finding.NO_TURN));
        }
        if (w.kind() != StepKind.SHORT_PULSES) {
            double band = Math.max(tol.finalErrorMinMw(), tol.finalErrorPct() / 100.0 * Math.abs(m.requestedChangeMw()));
            rows.add(because(cause, max(s, "final error", Math.abs(m.finalErrorMw()), band, "MW", 2,
                    Finding.FINAL_ERROR)));
        }
        rows.add(commands(s, e));
    }

    /** A failed row that only follows from the unit not moving (or moving the wrong way) carries that finding. */
    private static Judgement because(Finding cause, Judgement row) {
        if (cause == null || row.passed() || !row.measured()) {
            return row;
        }
        return new Judgement(row.step(), row.figure(), false, true, row.decidingFigure(), row.limit(), cause);
    }

    private Judgement commands(String s, StepEvidence e) {
        boolean ok = e.refusals().isEmpty() && e.unanswered() == 0;
        String figure;
        if (ok) {
            figure = "none refused";
        } else {
            Map<RefusalReason, Long> byReason = e.refusals().stream()
                    .collect(Collectors.groupingBy(Refusal::reason, () -> new EnumMap<>(RefusalReason.class),
                            Collectors.counting()));
            figure = e.refusals().size() + " refused"
                    + (byReason.isEmpty() ? "" : " (" + byReason.entrySet().stream()
                            .map(x -> x.getKey().wireName() + " ×" + x.getValue())
                            .collect(Collectors.joining(", ")) + ")")
                    + (e.unanswered() > 0 ? ", " + e.unanswered() + " unanswered" : "");
        }
        Finding f = e.refusals().isEmpty() ? Finding.UNANSWERED : Finding.REFUSED;
        return new Judgement(s, "commands", ok, true, figure, "all accepted", f);
    }

    private void asymmetry(List<StepEvidence> steps, List<Judgement> rows) {
        double[] gain = new double[2];
        double[] ramp = new double[2];
        int[] gainN = new int[2];
        int[] rampN = new int[2];
        for (StepEvidence e : steps) {
            StepKind k = e.window().kind();
            if (k != StepKind.STAIRCASE && k != StepKind.RAMP_TO_LIMIT) {
                continue;
            }
            int i = e.window().direction() == PulseDirection.RAISE ? 0 : 1;
            if (!(e.measurement().measuredChangeMw() * e.window().sign() > noiseThresholdMw)) {
                continue; // a step that did not move the commanded way says nothing about symmetry
            }
            if (Double.isFinite(e.measurement().gainMwPerPulseS())) {
                gain[i] += e.measurement().gainMwPerPulseS();
                gainN[i]++;
            }
            if (Double.isFinite(e.measurement().rampMwPerMin())) {
                ramp[i] += e.measurement().rampMwPerMin();
                rampN[i]++;
            }
        }
        boolean any = steps.stream().anyMatch(e -> e.window().kind() == StepKind.STAIRCASE
                || e.window().kind() == StepKind.RAMP_TO_LIMIT);
        if (!any) {
            return;
        }
        String limit = "≤ " + fmt(tol.asymmetryMaxPct(), 1, "%");
        rows.add(gainN[0] > 0 && gainN[1] > 0
                ? asym("gain asymmetry raise vs lower", gain[0] / gainN[0], gain[1] / gainN[1], "MW/pulse-s", 3)
                : Judgement.notMeasured("all steps", "gain asymmetry raise vs lower", limit));
        rows.add(rampN[0] > 0 && rampN[1] > 0
                ? asym("ramp asymmetry raise vs lower", ramp[0] / rampN[0], ramp[1] / rampN[1], "MW/min", 2)
                : Judgement.notMeasured("all steps", "ramp asymmetry raise vs lower", limit));
    }

    private Judgement asym(String figure, double raise, double lower, String unit, int decimals) {
        double mean = (Math.abs(raise) + Math.abs(lower)) / 2;
        double pct = mean == 0 ? Double.NaN : Math.abs(raise - lower) / mean * 100;
        if (!Double.isFinite(pct)) {
            return Judgement.notMeasured("all steps", figure, "≤ " + fmt(tol.asymmetryMaxPct(), 1, "%"));
        }
        boolean ok = pct <= tol.asymmetryMaxPct();
        return new Judgement("all steps", figure, ok, true,
                String.format(Locale.ROOT, "%.1f %% (raise %s, lower %s)", pct, fmt(raise, decimals, unit),
                        fmt(lower, decimals, unit)),
                "≤ " + fmt(tol.asymmetryMaxPct(), 1, "%"), Finding.ASYMMETRIC);
    }

    private static Judgement max(String step, String figure, double value, double limit, String unit, int decimals,
            Finding f) {
        if (!Double.isFinite(value)) {
            return Judgement.notMeasured(step, figure, "≤ " + fmt(limit, decimals, unit));
        }
        return new Judgement(step, figure, value <= limit, true, fmt(value, decimals, unit),
                "≤ " + fmt(limit, decimals, unit), f);
    }

    private static Judgement within(String step, String figure, double value, double expected, double pct, String unit,
            int decimals, Finding low, Finding high) {
        double dev = (value - expected) / expected * 100;
        String limit = fmt(expected, decimals, unit) + " ± " + fmt(pct, 0, "%");
        if (!Double.isFinite(dev)) {
            return Judgement.notMeasured(step, figure, limit);
        }
        String shown = fmt(value, decimals, unit) + String.format(Locale.ROOT, " (%+.1f %%)", dev);
        return new Judgement(step, figure, Math.abs(dev) <= pct, true, shown, limit, dev < 0 ? low : high);
    }

    static String fmt(double v, int decimals, String unit) {
        if (!Double.isFinite(v)) {
            return Judgement.NOT_MEASURED;
        }
        return String.format(Locale.ROOT, "%." + decimals + "f %s", v, unit);
    }
}
