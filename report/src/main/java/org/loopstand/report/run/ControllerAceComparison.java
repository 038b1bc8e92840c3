package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

import org.loopstand.report.metrics.Percentiles;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.TimeSeries;

/**
 * The controller's own ACE beside the ACE the rig computes from what the meters published. Both use
 * the same readings, so they should agree up to the controller's data age; a persistent offset or an
 * opposite sign is a commissioning finding (wrong schedule, wrong bias, wrong tie sign), named as one.
 *
 * @param meanControllerAceMw mean of the controller's ACE over all its values, MW
 * @param samples       pairs compared (one per controller ACE value with a metered ACE before it)
 * @param meanDiffMw    mean of controller − metered, MW
 * @param medianDiffMw  median of controller − metered, MW
 * @param p90AbsDiffMw  90th percentile of |controller − metered|, MW
 * @param correlation   Pearson correlation of the two, NaN when either does not vary
 * @param finding       the commissioning finding, if any
 */
record ControllerAceComparison(double meanControllerAceMw, int samples, double meanDiffMw, double medianDiffMw, double p90AbsDiffMw, double correlation,
                               Optional<String> finding) {
    /** Fewer pairs than this decide nothing. */
    static final int MIN_SAMPLES = 10;
    /** Correlation at or below this is called a sign flip (common practice, no source). */
    static final double SIGN_FLIP_CORRELATION = -0.5;
    /** A median difference beyond max(this, β·{@value #OFFSET_HZ} Hz) is called an offset, MW. */
    static final double OFFSET_MIN_MW = 10;
    static final double OFFSET_HZ = 0.01;

    /**
     * @param controller  the controller's ACE (from its statuses or journal), MW
     * @param metered     the rig's ACE from the published meter readings, MW
     * @param betaMwPerHz the area's bias β, MW/Hz (sets the offset threshold)
     */
    static ControllerAceComparison of(TimeSeries controller, TimeSeries metered, double betaMwPerHz) {
        List<double[]> pairs = new ArrayList<>();
        for (int i = 0; i < controller.size(); i++) {
            double m = metered.valueAt(controller.timeMs(i));
            if (Double.isFinite(m) && Double.isFinite(controller.value(i))) {
                pairs.add(new double[] {controller.value(i), m});
            }
        }
        int n = pairs.size();
        double[] diff = new double[n];
        double[] absDiff = new double[n];
        double sumC = 0;
        double sumM = 0;
        for (int i = 0; i < n; i++) {
            diff[i] = pairs.get(i)[0] - pairs.get(i)[1];
            absDiff[i] = Math.abs(diff[i]);
            sumC += pairs.get(i)[0];
            sumM += pairs.get(i)[1];
        }
        double meanDiff = n == 0 ? Double.NaN : java.util.Arrays.stream(diff).average().orElse(Double.NaN);
        double median = Percentiles.nearestRank(diff, 50);
        double p90 = Percentiles.nearestRank(absDiff, 90);
        double corr = correlation(pairs, sumC / Math.max(n, 1), sumM / Math.max(n, 1));
        Optional<String> finding = Optional.empty();
        double offsetLimit = Math.max(OFFSET_MIN_MW, Double.isFinite(betaMwPerHz) ? betaMwPerHz * OFFSET_HZ : 0);
        if (n >= MIN_SAMPLES) {
            if (corr <= SIGN_FLIP_CORRELATION) {
                finding = Optional.of(String.format(Locale.ROOT, "the controller's ACE moves against the metered ACE"
                        + " (correlation %.2f): a sign flip, e.g. a wrong tie-flow or interchange sign or the other ACE"
                        + " sign convention", corr));
            } else if (Math.abs(median) > offsetLimit) {
                finding = Optional.of(String.format(Locale.ROOT, "the controller's ACE is offset from the metered ACE by"
                        + " %.1f MW (median; limit %.1f MW): a wrong schedule, a wrong bias or a missing tie", median, offsetLimit));
            }
        }
        double meanCtl = java.util.Arrays.stream(controller.values()).filter(Double::isFinite).average().orElse(Double.NaN);
        return new ControllerAceComparison(meanCtl, n, meanDiff, median, p90, corr, finding);
    }

    /** @return the figures as report metrics for one area */
    List<Metric> metrics(String source) {
        List<Metric> m = new ArrayList<>();
        m.add(Metric.of("mean controller ACE", meanControllerAceMw, 2, "MW", source));
        m.add(Metric.of("controller ACE samples compared", samples, 0, "", source + " against the rig's metered ACE"));
        m.add(Metric.of("controller − metered ACE, median", medianDiffMw, 2, "MW", "mean " + fmt(meanDiffMw) + " MW"));
        m.add(Metric.of("|controller − metered ACE|, p90", p90AbsDiffMw, 2, "MW", "includes the controller's data age"));
        m.add(Metric.of("correlation controller / metered ACE", correlation, 3, "", "Pearson"));
        m.add(new Metric("commissioning finding", finding.orElse(samples < MIN_SAMPLES ? "not judged: fewer than "
                + MIN_SAMPLES + " samples" : "none: the controller's ACE agrees with the metered ACE"), "", ""));
        return m;
    }

    private static double correlation(List<double[]> pairs, double meanC, double meanM) {
        double sxy = 0;
        double sxx = 0;
        double syy = 0;
        for (double[] p : pairs) {
            sxy += (p[0] - meanC) * (p[1] - meanM);
            sxx += (p[0] - meanC) * (p[0] - meanC);
            syy += (p[1] - meanM) * (p[1] - meanM);
        }
        return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : Double.NaN;
    }

    private static String fmt(double v) {
        return String.format(Locale.ROOT, "%.2f", v);
    }
}
