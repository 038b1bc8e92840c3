package org.loopstand.controller.pulsetest.analysis;

import java.util.ArrayList;
import java.util.List;
import org.loopstand.controller.pulsetest.plan.StepKind;

/**
 * Measures one step's response from the output samples. Pure: the same samples give the same figures.
 * Definitions (also in docs/pulse-test.md) are in {@link StepMeasurement}.
 */
public final class StepResponseAnalyzer {
    private final double noiseThresholdMw;
    private final long averagingMs;
    private final double settleBandPct;
    private final double settleBandMinMw;

    /**
     * @param noiseThresholdMw output change that counts as movement, MW, &gt; 0
     * @param averagingS       baseline and final-value averaging window, s, &gt; 0
     * @param settleBandPct    settling band, % of the requested change
     * @param settleBandMinMw  settling band at least this, MW
     */
    public StepResponseAnalyzer(double noiseThresholdMw, double averagingS, double settleBandPct,
            double settleBandMinMw) {
        this.noiseThresholdMw = noiseThresholdMw;
        this.averagingMs = Math.round(averagingS * 1000);
        this.settleBandPct = settleBandPct;
        this.settleBandMinMw = settleBandMinMw;
    }

    /** @return settling band for a requested change, MW */
    public double settleBandMw(double requestedChangeMw) {
        return Math.max(settleBandMinMw, settleBandPct / 100.0 * Math.abs(requestedChangeMw));
    }

    /**
     * @param w       the step
     * @param samples all output samples of the run, time order (only the relevant ones are used)
     */
    public StepMeasurement analyze(StepWindow w, List<OutputSample> samples) {
        double baseline = baseline(samples, w.startMs());
        List<OutputSample> in = new ArrayList<>();
        for (OutputSample s : samples) {
            if (s.tMs() > w.startMs() && s.tMs() <= w.endMs()) {
                in.add(s);
            }
        }
        double fin = mean(samples, w.endMs() - averagingMs, w.endMs());
        double change = fin - baseline;
        double sign = w.sign();
        double peak = 0;
        double firstMove = Double.NaN;
        boolean opposite = false;
        for (OutputSample s : in) {
            double d = s.outputMw() - baseline;
            peak = Math.max(peak, Math.abs(d));
            if (sign != 0 && Double.isNaN(firstMove) && d * sign > noiseThresholdMw) {
                firstMove = (s.tMs() - w.startMs()) / 1000.0;
            }
        }
        // Opposite means the net move went the wrong way; a unit still finishing the previous step may
        // drift against the command for a while without that being a swapped direction.
        if (sign != 0 && change * sign < -noiseThresholdMw) {
            opposite = true;
        }
        double ramp = Double.NaN;
        double deadTime = firstMove;
        double[] fit = Math.abs(change) > 2 * noiseThresholdMw && w.kind() != StepKind.REVERSAL
                ? fit1090(in, w.startMs(), baseline, change) : null;
        if (fit != null && fit[1] != 0) {
            ramp = Math.abs(fit[1]) * 60_000.0;
            double crossMs = (baseline - fit[0]) / fit[1];
            if (!opposite) {
                deadTime = Math.max(0, crossMs / 1000.0);
            }
        }
        // Figures that describe the commanded move exist only when the unit made it: a unit that did not
        // move has no dead time, ramp, overshoot or settling time, and one that moved the wrong way has
        // none of the commanded move (its wrong move is judged as such).
        boolean movedAsCommanded = sign != 0 && change * sign > noiseThresholdMw;
        if (!movedAsCommanded && w.kind() != StepKind.REVERSAL) {
            deadTime = Double.NaN;
            ramp = Double.NaN;
        }
        double gain = w.pulseSeconds() > 0 && sign != 0 && w.kind() != StepKind.REVERSAL
                ? change * sign / w.pulseSeconds() : Double.NaN;
        double overshoot = movedAsCommanded ? overshoot(in, fin, change) : Double.NaN;
        double settling = movedAsCommanded ? settling(in, w, fin) : Double.NaN;
        double finalError = fin - (baseline + w.requestedChangeMw());
        double turnDelay = w.reverseMs() >= 0 ? turnDelay(in, w, baseline) : Double.NaN;
        return new StepMeasurement(baseline, fin, change, w.requestedChangeMw(), firstMove, deadTime, ramp, gain,
                overshoot, settling, finalError, peak, turnDelay, opposite, in.size());
    }

    private double baseline(List<OutputSample> samples, long startMs) {
        double m = mean(samples, startMs - averagingMs, startMs);
        if (!Double.isNaN(m)) {
            return m;
        }
        OutputSample last = null;
        for (OutputSample s : samples) {
            if (s.tMs() <= startMs) {
                last = s;
            }
        }
        return last == null ? Double.NaN : last.outputMw();
    }

    /** Mean of samples with from &lt; t ≤ to; NaN if none. */
    static double mean(List<OutputSample> samples, long fromMs, long toMs) {
        double sum = 0;
        int n = 0;
        for (OutputSample s : samples) {
            if (s.tMs() > fromMs && s.tMs() <= toMs) {
                sum += s.outputMw();
                n++;
            }
        }
        return n == 0 ? Double.NaN : sum / n;
    }

    /**
     * Least-squares line y = a + b·(t − t0) over the samples from the first at ≥ 10 % of the move to
     * the first at ≥ 90 % (both included).
     *
     * @return {a (MW), b (MW/ms)} with t in ms after {@code t0}, or null with fewer than 2 points
     */
    private static double[] fit1090(List<OutputSample> in, long t0, double baseline, double change) {
        List<OutputSample> pts = new ArrayList<>();
        boolean started = false;
        for (OutputSample s : in) {
            double p = (s.outputMw() - baseline) / change;
            if (!started && p >= 0.1) {
                started = true;
            }
            if (started) {
                pts.add(s);
                if (p >= 0.9) {
                    break;
                }
            }
        }
        if (pts.size() < 2) {
            return null;
        }
        double sx = 0, sy = 0, sxx = 0, sxy = 0;
        int n = pts.size();
        for (OutputSample s : pts) {
            double x = s.tMs() - t0;
            sx += x;
            sy += s.outputMw();
            sxx += x * x;
            sxy += x * s.outputMw();
        }
        double den = n * sxx - sx * sx;
        if (den == 0) {
            return null;
        }
        double b = (n * sxy - sx * sy) / den;
        double a = (sy - b * sx) / n;
        return new double[] {a, b};
    }

    private static double overshoot(List<OutputSample> in, double fin, double change) {
        double dir = Math.signum(change);
        double worst = 0;
        for (OutputSample s : in) {
            worst = Math.max(worst, (s.outputMw() - fin) * dir);
        }
        return worst / Math.abs(change) * 100.0;
    }

    private double settling(List<OutputSample> in, StepWindow w, double fin) {
        if (in.isEmpty()) {
            return Double.NaN;
        }
        double band = settleBandMw(w.requestedChangeMw());
        int lastOutside = -1;
        for (int i = 0; i < in.size(); i++) {
            if (Math.abs(in.get(i).outputMw() - fin) > band) {
                lastOutside = i;
            }
        }
        if (lastOutside == in.size() - 1) {
            return Double.NaN;
        }
        long settledAt = lastOutside < 0 ? w.startMs() : in.get(lastOutside + 1).tMs();
        return (settledAt - w.startMs()) / 1000.0;
    }

    /** NaN when the output never moved beyond the noise threshold in the first direction: it had nothing to turn. */
    private double turnDelay(List<OutputSample> in, StepWindow w, double baseline) {
        double best = Double.NEGATIVE_INFINITY;
        long at = -1;
        for (OutputSample s : in) {
            double d = (s.outputMw() - baseline) * w.sign();
            if (d > best) {
                best = d;
                at = s.tMs();
            }
        }
        return at < 0 || !(best > noiseThresholdMw) ? Double.NaN : Math.max(0, (at - w.reverseMs()) / 1000.0);
    }
}
