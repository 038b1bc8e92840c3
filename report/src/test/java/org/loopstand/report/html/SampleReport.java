package org.loopstand.report.html;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.loopstand.report.metrics.AceStatistics;
import org.loopstand.report.metrics.BaalEvaluator;
import org.loopstand.report.metrics.Cps1Calculator;
import org.loopstand.report.metrics.FrequencyExcursion;
import org.loopstand.report.metrics.Interconnection;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.Histogram;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;
import org.loopstand.report.model.TimeSeries;

/** An invented demo run (no real site or plant): a 150 MW load step at 300 s in a 60 Hz area. */
final class SampleReport {
    static final long START_MS = 1_700_000_040_000L;
    static final int DURATION_S = 1800;

    private SampleReport() {
    }

    static ReportModel model(boolean cutShort) {
        int n = DURATION_S + 1;
        long[] t = new long[n];
        double[] f = new double[n];
        double[] ace = new double[n];
        double[] tie = new double[n];
        double[] out = new double[n];
        double[] set = new double[n];
        double[] pulse = new double[n];
        double[] quality = new double[n];
        double[] fault = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = START_MS + i * 1000L;
            double s = i - 300.0;
            double wobble = 0.002 * Math.sin(i / 37.0) + 0.001 * Math.sin(i / 5.3);
            double dev = s < 0 ? 0 : -0.09 * Math.exp(-s / 60.0) * Math.cos(s / 9.0) - 0.03 * Math.exp(-s / 240.0);
            f[i] = 60.0 + dev + wobble;
            tie[i] = 200.0 + (s < 0 ? 0 : -60 * Math.exp(-s / 200.0)) + 3 * Math.sin(i / 23.0);
            ace[i] = (tie[i] - 200.0) - 10 * (-80.0) * (f[i] - 60.0);
            set[i] = 310 + (s < 0 ? 0 : Math.min(150, s * 0.5));
            out[i] = i == 0 ? set[0] : out[i - 1] + (set[i] - out[i - 1]) * 0.08;
            pulse[i] = (s >= 0 && s < 300 && i % 4 == 0) ? 1 : 0;
            quality[i] = (i >= 900 && i < 960) ? 1 : (i >= 1500 && i < 1512) ? 2 : 0;
            fault[i] = (i >= 880 && i < 970) ? 1 : 0;
        }
        TimeSeries freq = new TimeSeries("frequency north", "Hz", t, f);
        TimeSeries aceS = new TimeSeries("ACE north", "MW", t, ace);
        AceStatistics as = AceStatistics.of(aceS, new double[] {10, 50});
        Cps1Calculator.Result cps1 = Cps1Calculator.evaluate(aceS, freq, 60.0, -80.0, Interconnection.EASTERN.epsilon1Hz());
        BaalEvaluator.Result baal = BaalEvaluator.evaluate(aceS, freq, 60.0, -80.0, Interconnection.EASTERN.epsilon1Hz());
        FrequencyExcursion ex = FrequencyExcursion.of(freq, START_MS + 300_000, 60.0, 0.02).orElseThrow();
        FrequencyExcursion.AceRecovery rec = FrequencyExcursion.aceRecovery(aceS, START_MS + 300_000, 0,
                FrequencyExcursion.Direction.LOSS_OF_SUPPLY, 900);

        List<CheckResult> checks = List.of(
                new CheckResult("ACE recovered after the load step", rec.passes(),
                        rec.recoveryTimeS().isPresent() ? String.format("%.0f s", rec.recoveryTimeS().getAsDouble()) : "never",
                        "≤ 900 s", "NERC BAL-002, from memory"),
                new CheckResult("CPS1 over the run", cps1.passes(), String.format("%.1f %%", cps1.cps1Pct()), "≥ 100 %",
                        "NERC BAL-001-2, from memory"),
                new CheckResult("BAAL exceedance run", baal.passes(), baal.longestExceedanceMinutes() + " min",
                        "≤ 30 min", "NERC BAL-001-2, from memory"),
                new CheckResult("Frequency nadir", ex.nadirHz() > 59.85, String.format("%.3f Hz", ex.nadirHz()),
                        "> 59.850 Hz", "scenario limit"));
        List<MetricSection> sections = List.of(
                new MetricSection("Area north: ACE", MetricSection.Group.FREQUENCY_QUALITY, List.of(
                        Metric.of("Mean ACE", as.meanMw(), 2, "MW", "over samples"),
                        Metric.of("σ ACE", as.sigmaMw(), 2, "MW", "population"),
                        Metric.of("p90 |ACE|", as.p90AbsMw(), 2, "MW", "nearest rank"),
                        Metric.of("Time |ACE| < 10 MW", as.timeInBandS().get(0).durationS(), 0, "s", "zero-order hold"))),
                new MetricSection("Area north: NERC measures", MetricSection.Group.FREQUENCY_QUALITY, List.of(
                        Metric.of("CPS1", cps1.cps1Pct(), 1, "%", "ε1 = 0.018 Hz, B = −80 MW/0.1 Hz"),
                        Metric.of("BAAL exceedance minutes", baal.exceedanceMinutes(), 0, "min", ""),
                        Metric.of("Nadir", ex.nadirHz(), 4, "Hz", "after the step"),
                        Metric.of("Settling into ±20 mHz", ex.settlingTimeS().orElse(Double.NaN), 0, "s", ""))),
                new MetricSection("Controller intake", MetricSection.Group.COMMUNICATION, List.of(
                        Metric.of("Meter rate", 0.5, 2, "1/s", "areaMeter messages"),
                        Metric.of("Meter loss", 0.4, 2, "%", "seq gaps"),
                        Metric.of("Age at use p99", 2150, 0, "ms", "nearest rank"),
                        new Metric("Refusals", "expired 2, atLimit 1", "", "by reason"))));
        List<Chart> charts = List.of(
                new Chart("Frequency", "Hz", List.of(freq), false),
                new Chart("ACE", "MW", List.of(aceS), false),
                new Chart("Tie flows", "MW", List.of(new TimeSeries("tie north-south", "MW", t, tie)), false),
                new Chart("Unit output vs setpoint", "MW", List.of(new TimeSeries("unit g1 output", "MW", t, out),
                        new TimeSeries("unit g1 setpoint", "MW", t, set)), false),
                new Chart("Pulses", "raise +1 / lower −1", List.of(new TimeSeries("pulses g1", "", t, pulse)), true),
                new Chart("Data quality and faults", "code", List.of(
                        new TimeSeries("meter quality (0 good, 1 questionable, 2 invalid)", "", t, quality),
                        new TimeSeries("fault: meter delay", "on/off", t, fault)), true));
        List<Histogram> hist = List.of(new Histogram("Command latency end to end", "ms",
                new double[] {1, 2, 5, 10, 20, 50, 100}, new long[] {3, 40, 180, 60, 9, 2, 0}));
        Map<String, String> config = new LinkedHashMap<>();
        config.put("site", "demo-site (invented)");
        config.put("scenario", "step-load");
        config.put("controller.cycleS", "4");
        config.put("area.north.biasMwPer0p1Hz", "-80");
        Map<String, String> versions = new LinkedHashMap<>();
        versions.put("loopstand", "0.1.0-SNAPSHOT");
        versions.put("java", "17");
        List<String> notes = new ArrayList<>();
        if (cutShort) {
            notes.add("plant.jsonl: torn last line at byte 1234567 ignored");
        }
        return new ReportModel(new RunInfo("20231114T221400-step-load", "demo-site", "step-load", START_MS,
                START_MS + DURATION_S * 1000L, cutShort, cutShort ? "controller.jsonl has no end entry." : ""),
                checks, sections, charts, hist, config, versions, notes);
    }
}
