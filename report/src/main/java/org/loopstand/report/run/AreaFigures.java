package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.OptionalDouble;

import org.loopstand.report.metrics.AceStatistics;
import org.loopstand.report.metrics.BaalEvaluator;
import org.loopstand.report.metrics.Cps1Calculator;
import org.loopstand.report.metrics.FrceStatistics;
import org.loopstand.report.metrics.FrequencyExcursion;
import org.loopstand.report.metrics.InadvertentEnergy;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.TimeSeries;

/**
 * Frequency-quality figures of one area from an ACE series the rig computed (from truth or from the
 * published meters): ACE statistics, CPS1, BAAL, FRCE, frequency extremes, inadvertent energy, and
 * after each disturbance the excursion and the ACE recovery. These are figures, never checks: only the
 * scenario's checks decide the verdict, so nothing here says FAIL.
 */
final class AreaFigures {
    private AreaFigures() {
    }

    /**
     * @param a      the area
     * @param ace    ACE, MW (positive = over-generation)
     * @param f      the frequency paired with that ACE (truth with truth, metered with metered), Hz
     * @param ni     net interchange from truth for inadvertent energy, or null to leave it out
     * @param source where the ACE comes from, shown in the title and notes
     */
    static MetricSection quality(RunReportBuilder.AreaInfo a, TimeSeries ace, TimeSeries f, TimeSeries ni, double eps,
            String source) {
        List<Metric> m = new ArrayList<>();
        String fs = RunReportBuilder.trim(a.nominalHz());
        if (ace.size() == 0) {
            m.add(new Metric("ACE", "not measured", "MW", "no " + source + " values in the record"));
        } else {
            AceStatistics s = AceStatistics.of(ace, RunReportBuilder.ACE_BANDS_MW);
            m.add(Metric.of("ACE samples", s.samples(), 0, "", source));
            m.add(Metric.of("mean ACE", s.meanMw(), 2, "MW", "(NIa − NIs) + β·(Fa − Fs)"));
            m.add(Metric.of("σ ACE", s.sigmaMw(), 2, "MW", "population σ"));
            m.add(Metric.of("p50 |ACE|", s.p50AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("p90 |ACE|", s.p90AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("p99 |ACE|", s.p99AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("max |ACE|", s.maxAbsMw(), 2, "MW", ""));
            for (AceStatistics.Band b : s.timeInBandS()) {
                m.add(Metric.of(String.format(Locale.ROOT, "time with |ACE| in [%s, %s) MW", RunReportBuilder.trim(b.lowerAbsMw()),
                        Double.isInfinite(b.upperAbsMw()) ? "∞" : RunReportBuilder.trim(b.upperAbsMw())), b.durationS(), 0, "s",
                        "zero-order hold; bands = the built-in controller's quiet / assist defaults"));
            }
            if (a.betaMwPerHz() > 0) {
                cps(a, ace, f, eps, fs, m);
            } else {
                m.add(new Metric("CPS1, BAAL, FRCE", "not measured", "", "the site gives no bias β for this area"));
            }
        }
        if (f.size() > 0) {
            double min = Double.POSITIVE_INFINITY;
            double max = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < f.size(); i++) {
                min = Math.min(min, f.value(i));
                max = Math.max(max, f.value(i));
            }
            m.add(Metric.of("lowest frequency", min, 4, "Hz", source + ", whole run"));
            m.add(Metric.of("highest frequency", max, 4, "Hz", source + ", whole run"));
        }
        if (ni != null && ni.size() > 1) {
            long[] t = {ni.timeMs(0), ni.timeMs(ni.size() - 1)};
            InadvertentEnergy ie = InadvertentEnergy.of(ni, new TimeSeries("NIs", "MW", t,
                    new double[] {a.scheduledNiMw(), a.scheduledNiMw()}));
            m.add(Metric.of("inadvertent energy (net)", ie.netMwh(), 3, "MWh", "∫(NIa − NIs)dt, NIa from plant truth, NIs = "
                    + RunReportBuilder.trim(a.scheduledNiMw()) + " MW from the site's tie schedules"));
            m.add(Metric.of("inadvertent energy over / under", ie.overMwh(), 3, "MWh", String.format(Locale.ROOT,
                    "under: %.3f MWh", ie.underMwh())));
        }
        return new MetricSection("Area " + a.id() + ": frequency quality, " + source, MetricSection.Group.FREQUENCY_QUALITY, m);
    }

    private static void cps(RunReportBuilder.AreaInfo a, TimeSeries ace, TimeSeries f, double eps, String fs, List<Metric> m) {
        double b = -a.betaMwPerHz() / 10.0;
        Cps1Calculator.Result c = Cps1Calculator.evaluate(ace, f, a.nominalHz(), b, eps);
        m.add(Metric.of("CPS1", c.cps1Pct(), 1, "%", c.minutes() + " clock minutes, FS = " + fs + " Hz, B = "
                + RunReportBuilder.trim(b) + " MW/0.1 Hz; NERC BAL-001-2 (from memory), indicative over one run; ≥ 100 % meets it"));
        BaalEvaluator.Result br = BaalEvaluator.evaluate(ace, f, a.nominalHz(), b, eps);
        m.add(Metric.of("BAAL exceedance minutes", br.exceedanceMinutes(), 0, "min", "clock minutes outside BAAL"));
        m.add(new Metric("BAAL longest exceedance", br.longestExceedanceMinutes() + (br.passes() ? " (within 30)" : " (over 30)"),
                "min", "NERC BAL-001-2 (from memory) allows at most 30 consecutive clock minutes"));
        FrceStatistics fr = FrceStatistics.of(ace, a.betaMwPerHz() * RunReportBuilder.FRCE_LEVEL1_HZ,
                a.betaMwPerHz() * RunReportBuilder.FRCE_LEVEL2_HZ);
        m.add(Metric.of("FRCE 15-min intervals", fr.intervals().size(), 0, "", "aligned quarter hours with data"));
        m.add(Metric.of("FRCE mean of 15-min means", fr.meanOfMeans(), 2, "MW", "FRCE = ACE of the area"));
        m.add(Metric.of("FRCE σ of 15-min means", fr.sigmaOfMeans(), 2, "MW", ""));
        m.add(Metric.of("FRCE share outside level 1", fr.outsideLevel1Pct(), 1, "%", String.format(Locale.ROOT,
                "level 1 = β·%s Hz = %.0f MW (configured assumption; SOGL Annex III style, from memory)",
                RunReportBuilder.trim(RunReportBuilder.FRCE_LEVEL1_HZ), a.betaMwPerHz() * RunReportBuilder.FRCE_LEVEL1_HZ)));
        m.add(Metric.of("FRCE share outside level 2", fr.outsideLevel2Pct(), 1, "%", String.format(Locale.ROOT,
                "level 2 = β·%s Hz = %.0f MW", RunReportBuilder.trim(RunReportBuilder.FRCE_LEVEL2_HZ),
                a.betaMwPerHz() * RunReportBuilder.FRCE_LEVEL2_HZ)));
    }

    /** Excursion after one disturbance (truth frequency) and the truth ACE's recovery, as figures. */
    static MetricSection excursion(RunReportBuilder.AreaInfo a, RunReportBuilder.Disturbance d, TimeSeries f, TimeSeries truthAce,
            long end) {
        List<Metric> m = new ArrayList<>();
        m.add(recovery(d, truthAce, end));
        Optional<FrequencyExcursion> x = FrequencyExcursion.of(f, d.tMs(), a.nominalHz(), RunReportBuilder.SETTLING_BAND_HZ);
        if (x.isPresent()) {
            m.add(Metric.of("nadir", x.get().nadirHz(), 4, "Hz", "at " + relS(x.get().nadirTimeMs(), d) + " s after the event"));
            m.add(Metric.of("zenith", x.get().zenithHz(), 4, "Hz", "at " + relS(x.get().zenithTimeMs(), d) + " s after the event"));
            OptionalDouble st = x.get().settlingTimeS();
            m.add(Metric.of("settling time", st.orElse(Double.NaN), 0, "s", "into ±" + RunReportBuilder.trim(RunReportBuilder.SETTLING_BAND_HZ)
                    + " Hz of " + RunReportBuilder.trim(a.nominalHz()) + " Hz and staying until the next event or the end"
                    + (st.isEmpty() ? "; did not settle" : "")));
        } else {
            m.add(new Metric("nadir", "not measured", "Hz", "no frequency after the event in the record"));
        }
        return new MetricSection(String.format(Locale.ROOT, "Area %s: after %s at %s s", a.id(), d.type(), RunReportBuilder.trim(d.atS())),
                MetricSection.Group.FREQUENCY_QUALITY, m);
    }

    /** ACE recovery after a disturbance, from the truth ACE: a figure with its limit, not a check. */
    static Metric recovery(RunReportBuilder.Disturbance d, TimeSeries truthAce, long end) {
        String how = "truth ACE back to min(0, ACE before) for a loss of supply, max(0, …) for a loss of load;"
                + " NERC BAL-002 (from memory) allows 900 s";
        if (truthAce.size() == 0) {
            return new Metric("ACE recovery", "not measured", "", "no truth ACE in the record");
        }
        double pre = truthAce.valueAt(d.tMs() - 1);
        FrequencyExcursion.AceRecovery r = FrequencyExcursion.aceRecovery(truthAce, d.tMs(), Double.isNaN(pre) ? 0 : pre,
                d.direction(), FrequencyExcursion.BAL002_RECOVERY_PERIOD_S);
        String figure = r.recoveryTimeS().isPresent()
                ? String.format(Locale.ROOT, "%.0f s (to %.1f MW)%s", r.recoveryTimeS().getAsDouble(), r.recoveryValueMw(),
                        r.passes() ? "" : ", later than 900 s")
                : String.format(Locale.ROOT, "not recovered in the %.0f s recorded after it", (end - d.tMs()) / 1000.0);
        return new Metric("ACE recovery", figure, "", how);
    }

    private static String relS(long t, RunReportBuilder.Disturbance d) {
        return String.format(Locale.ROOT, "%.1f", (t - d.tMs()) / 1000.0);
    }
}
