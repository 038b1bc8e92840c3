package org.loopstand.controller.pulsetest;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import org.loopstand.controller.pulsetest.analysis.Finding;
import org.loopstand.controller.pulsetest.analysis.Judgement;
import org.loopstand.controller.pulsetest.analysis.StepMeasurement;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.safety.SafetyGate;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.report.html.HtmlReportWriter;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;
import org.loopstand.report.model.TimeSeries;

/**
 * Writes a pulse test's run folder: {@code result.json} (every figure and row), {@code telemetry.csv}
 * (samples as received) and {@code report.html} (the same kind of report as a rehearsal).
 */
public final class PulseTestRunFolder {
    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
    private static final DateTimeFormatter STAMP = DateTimeFormatter.ofPattern("yyyyMMdd'T'HHmmss").withZone(ZoneOffset.UTC);

    private PulseTestRunFolder() {
    }

    /** @return folder name for a run: {@code 20260101T120000-pulse-test-unit} */
    public static String runId(long startedMs, String unit) {
        return STAMP.format(Instant.ofEpochMilli(startedMs)) + "-pulse-test-" + unit;
    }

    /**
     * @param dir           run folder (created)
     * @param configuration what the run was started with, key → value, shown in the report
     * @return the HTML report's path
     */
    public static Path write(Path dir, PulseTestResult result, TestPlan plan, String site,
            Map<String, String> configuration) {
        try {
            Files.createDirectories(dir);
            Files.writeString(dir.resolve("result.json"), JSON.writeValueAsString(json(result, plan)));
            Files.writeString(dir.resolve("telemetry.csv"), csv(result.record()));
            StringBuilder f = new StringBuilder("tMs,frequencyHz\r\n");
            result.record().frequency().forEach(p -> f.append(p.tMs()).append(',').append(p.frequencyHz()).append("\r\n"));
            Files.writeString(dir.resolve("frequency.csv"), f);
            return HtmlReportWriter.write(model(dir.getFileName().toString(), result, plan, site, configuration),
                    dir.resolve("report.html"));
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the run folder " + dir + ": " + e.getMessage(), e);
        }
    }

    /**
     * How far the run moved the unit and where it left it, from the readings: for every run that sent
     * pulses, and first of all for one cut short.
     *
     * @return e.g. "started at 700.00 MW, moved up to 12.10 MW from there, left at 711.80 MW (+11.80 MW) with
     *         its load reference at 712.00 MW"; empty when nothing was sent or nothing was read
     */
    public static Optional<String> whereLeft(PulseTestRecord rec) {
        Moved m = moved(rec);
        if (m == null) {
            return Optional.empty();
        }
        return Optional.of(String.format(Locale.ROOT, "started at %.2f MW, moved up to %.2f MW from there, "
                + "left at %.2f MW (%+.2f MW) with its load reference at %.2f MW; the %d pulse(s) sent ask for "
                + "%+.2f MW in all", m.startMw, m.maxExcursionMw, m.lastMw, m.lastMw - m.startMw, m.referenceMw,
                rec.pulses().size(), m.requestedMw));
    }

    private record Moved(double startMw, double maxExcursionMw, double lastMw, double referenceMw, double requestedMw) {
    }

    private static Moved moved(PulseTestRecord rec) {
        if (rec.pulses().isEmpty() || rec.programme() == null || rec.declaration() == null) {
            return null;
        }
        double start = rec.programme().startMw();
        double max = 0;
        TelemetryPoint last = null;
        for (TelemetryPoint t : rec.telemetry()) {
            if (t.good() && t.tMs() >= rec.programmeStartMs()) {
                max = Math.max(max, Math.abs(t.outputMw() - start));
                last = t;
            }
        }
        if (last == null) {
            return null;
        }
        double requested = 0;
        for (SentPulse p : rec.pulses()) {
            requested += (p.direction() == PulseDirection.RAISE ? 1 : -1) * rec.declaration().pulseRateMwPerMin()
                    * p.durationMs() / 60_000.0;
        }
        return new Moved(start, max, last.outputMw(), last.setpointMw(), requested);
    }

    static ObjectNode json(PulseTestResult r, TestPlan plan) {
        PulseTestRecord rec = r.record();
        ObjectNode root = JSON.createObjectNode();
        root.put("unit", rec.unit());
        root.put("plan", plan.name());
        root.put("verdict", r.verdict().name().toLowerCase(Locale.ROOT));
        root.put("state", rec.state().name().toLowerCase(Locale.ROOT));
        root.put("stopReason", rec.stopReason());
        root.put("startedMs", rec.startedMs());
        root.put("programmeStartMs", rec.programmeStartMs());
        root.put("stoppedMs", rec.stoppedMs());
        if (rec.declaration() != null) {
            root.set("declared", JSON.valueToTree(rec.declaration()));
        }
        root.put("pulsesSent", rec.pulses().size());
        Moved m = moved(rec);
        if (m != null) {
            ObjectNode left = root.putObject("unitMoved");
            left.put("startMw", m.startMw());
            left.put("maxExcursionMw", m.maxExcursionMw());
            left.put("leftAtMw", m.lastMw());
            left.put("changeFromStartMw", m.lastMw() - m.startMw());
            left.put("loadReferenceMw", m.referenceMw());
            left.put("requestedByPulsesSentMw", m.requestedMw());
        }
        if (rec.governor() != null) {
            root.set("governorRemoved", JSON.valueToTree(rec.governor()));
        }
        ArrayNode timings = root.putArray("stepTimings");
        rec.timings().forEach(t -> timings.add(JSON.valueToTree(t)));
        ArrayNode findings = root.putArray("findings");
        for (Finding f : r.findings()) {
            findings.add(f.text());
        }
        ArrayNode steps = root.putArray("steps");
        for (StepResult s : r.steps()) {
            ObjectNode n = steps.addObject();
            n.put("index", s.index());
            n.put("label", s.evidence().window().label());
            n.put("kind", s.evidence().window().kind().yamlName());
            n.put("expectedRampMwPerMin", s.evidence().expectedRampMwPerMin());
            n.put("expectedMoveS", s.evidence().expectedMoveS());
            n.set("measured", JSON.valueToTree(s.evidence().measurement()));
            n.set("measuredWithGovernorAnswer", JSON.valueToTree(s.evidence().asMeasured()));
            n.put("settleWaitS", s.evidence().settleWaitS());
            n.put("settled", s.evidence().settled());
            n.set("refusals", JSON.valueToTree(s.evidence().refusals()));
            n.put("unanswered", s.evidence().unanswered());
        }
        root.set("rows", JSON.valueToTree(r.rows()));
        root.set("notes", JSON.valueToTree(rec.notes()));
        return root;
    }

    private static String csv(PulseTestRecord rec) {
        StringBuilder b = new StringBuilder("tMs,outputMw,setpointMw,good,governorAnswerMw\r\n");
        for (TelemetryPoint t : rec.telemetry()) {
            b.append(t.tMs()).append(',').append(t.outputMw()).append(',').append(t.setpointMw()).append(',')
                    .append(t.good()).append(',').append(Double.isNaN(t.governorMw()) ? "" : t.governorMw())
                    .append("\r\n");
        }
        return b.toString();
    }

    static ReportModel model(String runId, PulseTestResult r, TestPlan plan, String site,
            Map<String, String> configuration) {
        PulseTestRecord rec = r.record();
        boolean cut = r.verdict() == PulseTestResult.Verdict.ABORTED || r.verdict() == PulseTestResult.Verdict.REFUSED;
        Optional<String> left = whereLeft(rec);
        RunInfo run = new RunInfo(runId, site, "pulse test " + plan.name() + " on unit " + rec.unit(), rec.startedMs(),
                Math.max(rec.startedMs(), rec.stoppedMs()), cut,
                cut ? r.verdict().name().toLowerCase(Locale.ROOT) + ": " + rec.stopReason()
                        + left.map(w -> ". Unit " + rec.unit() + " " + w).orElse("") : "");
        List<CheckResult> checks = new ArrayList<>();
        for (Judgement j : r.rows()) {
            checks.add(new CheckResult(j.step() + ": " + j.figure(), j.passed(), j.decidingFigure(), j.limit(),
                    j.passed() ? "plan " + plan.name() : !j.measured() ? "plan " + plan.name() + "; not measured: no "
                            + "finding is made from it, and it cannot pass"
                            : "plan " + plan.name() + "; finding: unit " + j.finding().text()));
        }
        List<String> notes = new ArrayList<>(SafetyGate.CAUTIONS);
        if (left.isPresent()) {
            notes.add(0, "Unit " + rec.unit() + ": " + left.get() + ".");
        }
        if (!rec.stopReason().isEmpty()) {
            notes.add(0, "Run " + rec.state().name().toLowerCase(Locale.ROOT) + ": " + rec.stopReason()
                    + (r.verdict() == PulseTestResult.Verdict.ABORTED ? ". Judged: the " + r.steps().size()
                            + " step(s) that ran to their end; nothing was sent after the stop" : ""));
        }
        for (Finding f : r.findings()) {
            notes.add("Finding: unit " + f.text());
        }
        notes.addAll(rec.notes());
        List<MetricSection> sections = new ArrayList<>();
        for (StepResult s : r.steps()) {
            StepMeasurement m = s.evidence().measurement();
            StepMeasurement raw = s.evidence().asMeasured();
            String ownNote = rec.governor() == null ? "" : " (own output: governor's answer removed)";
            sections.add(new MetricSection("Step " + (s.index() + 1) + ": " + s.evidence().window().label(),
                    MetricSection.Group.UNIT_RESPONSE, List.of(
                            Metric.of("measured change as measured", raw.measuredChangeMw(), 2, "MW",
                                    "output as read, governor's answer to frequency included"),
                            Metric.of("gain as measured", raw.gainMwPerPulseS(), 3, "MW/pulse-s", "output as read"),
                            Metric.of("ramp rate as measured", raw.rampMwPerMin(), 2, "MW/min", "output as read"),
                            Metric.of("wait for the unit to settle", s.evidence().settleWaitS(), 1, "s",
                                    s.evidence().settled() ? "beyond the planned window" : "timed out: not settled"),
                            Metric.of("requested change", m.requestedChangeMw(), 2, "MW", "declared pulse rate × pulse time"),
                            Metric.of("measured change", m.measuredChangeMw(), 2, "MW", "final mean − baseline mean" + ownNote),
                            Metric.of("dead time", m.deadTimeS(), 1, "s", "10–90 % fit meets baseline, from first pulse"),
                            Metric.of("ramp rate", m.rampMwPerMin(), 2, "MW/min", "least squares over 10–90 % of the move"),
                            Metric.of("expected ramp", s.evidence().expectedRampMwPerMin(), 2, "MW/min",
                                    "slower of declared ramp and pulse train rate"),
                            Metric.of("gain", m.gainMwPerPulseS(), 3, "MW/pulse-s", "measured change / pulse-seconds" + ownNote),
                            Metric.of("overshoot", m.overshootPct(), 1, "%", "beyond the final value"),
                            Metric.of("settling time", m.settlingTimeS(), 1, "s", "from first pulse into the band"),
                            Metric.of("final error", m.finalErrorMw(), 2, "MW", "final − (baseline + requested)"),
                            Metric.of("turn-round delay", m.turnDelayS(), 1, "s", "reversal: opposite pulses to peak"),
                            new Metric("refused commands", Integer.toString(s.evidence().refusals().size()), "", ""))));
        }
        List<Chart> charts = charts(rec);
        Map<String, String> config = new LinkedHashMap<>(configuration);
        config.put("plan", plan.name() + (plan.description().isEmpty() ? "" : " – " + plan.description()));
        if (rec.declaration() != null) {
            config.put("declared data", String.format(Locale.ROOT,
                    "%s: regulating %.1f–%.1f MW, ramp %.2f MW/min, pulse rate %.2f MW/min",
                    rec.declaration().source(), rec.declaration().regulatingMinMw(), rec.declaration().regulatingMaxMw(),
                    rec.declaration().rampMwPerMin(), rec.declaration().pulseRateMwPerMin()));
        }
        config.put("pulses sent", Integer.toString(rec.pulses().size()));
        Map<String, String> versions = new LinkedHashMap<>();
        versions.put("Loopstand", "0.1.0");
        versions.put("Java", Runtime.version().toString());
        return new ReportModel(run, checks, sections, charts, List.of(), config, versions, notes);
    }

    private static List<Chart> charts(PulseTestRecord rec) {
        List<Chart> charts = new ArrayList<>();
        List<TelemetryPoint> t = rec.telemetry();
        if (!t.isEmpty()) {
            long[] ts = t.stream().mapToLong(TelemetryPoint::tMs).toArray();
            double[] out = t.stream().mapToDouble(p -> p.good() ? p.outputMw() : Double.NaN).toArray();
            double[] ref = t.stream().mapToDouble(TelemetryPoint::setpointMw).toArray();
            List<TimeSeries> series = new ArrayList<>();
            series.add(new TimeSeries("measured output", "MW", ts, out));
            series.add(new TimeSeries("unit load reference", "MW", ts, ref));
            TimeSeries requested = requested(rec);
            if (requested != null) {
                series.add(requested);
            }
            charts.add(new Chart("Requested vs measured output " + rec.unit(), "MW", series, false));
        }
        if (!rec.pulses().isEmpty()) {
            int n = rec.pulses().size();
            long[] ts = new long[2 * n];
            double[] v = new double[2 * n];
            for (int i = 0; i < n; i++) {
                SentPulse p = rec.pulses().get(i);
                long end = Math.max(p.sentMs(), p.sentMs() + p.durationMs());
                ts[2 * i] = p.sentMs();
                v[2 * i] = p.direction() == PulseDirection.RAISE ? 1 : -1;
                ts[2 * i + 1] = i + 1 < n ? Math.min(end, rec.pulses().get(i + 1).sentMs()) : end;
                v[2 * i + 1] = 0;
            }
            charts.add(new Chart("Pulses sent (+1 raise, −1 lower)", "pulse",
                    List.of(new TimeSeries("pulse", "", ts, v)), true));
        }
        return charts;
    }

    /** Requested output: start + the declared pulse rate integrated over the pulses sent, as a step line. */
    private static TimeSeries requested(PulseTestRecord rec) {
        if (rec.programme() == null || rec.declaration() == null || rec.pulses().isEmpty()) {
            return null;
        }
        int n = rec.pulses().size();
        long[] ts = new long[n + 1];
        double[] v = new double[n + 1];
        ts[0] = rec.programmeStartMs();
        v[0] = rec.programme().startMw();
        double level = v[0];
        for (int i = 0; i < n; i++) {
            SentPulse p = rec.pulses().get(i);
            level += (p.direction() == PulseDirection.RAISE ? 1 : -1) * rec.declaration().pulseRateMwPerMin()
                    * p.durationMs() / 60_000.0;
            ts[i + 1] = Math.max(ts[i], p.sentMs() + p.durationMs());
            v[i + 1] = level;
        }
        return new TimeSeries("requested (declared pulse rate × pulses)", "MW", ts, v);
    }
}
