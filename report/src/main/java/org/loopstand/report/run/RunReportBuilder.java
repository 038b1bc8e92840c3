package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalDouble;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.report.metrics.AceStatistics;
import org.loopstand.report.metrics.BaalEvaluator;
import org.loopstand.report.metrics.Cps1Calculator;
import org.loopstand.report.metrics.FrceStatistics;
import org.loopstand.report.metrics.FrequencyExcursion;
import org.loopstand.report.metrics.InadvertentEnergy;
import org.loopstand.report.metrics.Interconnection;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;
import org.loopstand.report.model.TimeSeries;

/**
 * Fills a {@link ReportModel} from a run folder: charts, frequency-quality figures per area (with the
 * excursion and ACE recovery after each disturbance), the scenario checks (the {@code check} entries
 * the plant journals when the scenario ends),
 * communication figures, histograms, configuration and versions. Which journal field feeds which
 * figure is listed in docs/report.md.
 */
public final class RunReportBuilder {
    /** ε1 used when none is given: the Eastern Interconnection's (NERC BAL-001-2, from memory), Hz. */
    public static final double DEFAULT_EPSILON1_HZ = Interconnection.EASTERN.epsilon1Hz();
    /** Half width of the band frequency must settle in after a disturbance, Hz (common practice, no source). */
    public static final double SETTLING_BAND_HZ = 0.02;
    /** |ACE| band limits: the controller's default quiet and assist thresholds, MW. */
    static final double[] ACE_BANDS_MW = {5, 200};
    /** FRCE level 1 / level 2 ranges as frequency-equivalent of ACE (β·Δf): configured assumption, Hz. */
    static final double FRCE_LEVEL1_HZ = 0.02;
    static final double FRCE_LEVEL2_HZ = 0.04;

    private RunReportBuilder() {
    }

    /** An area as the plant header describes it. */
    record AreaInfo(String id, double nominalHz, double betaMwPerHz, double scheduledNiMw) {
    }

    /** A scenario disturbance: when, where, which way. */
    record Disturbance(String type, double atS, long tMs, String area, FrequencyExcursion.Direction direction) {
    }

    /** Same as {@link #build(RunFolder, Map, List, String, double)} with the default ε1. */
    public static ReportModel build(RunFolder run, Map<String, String> extraConfig, List<String> extraNotes, String version) {
        return build(run, extraConfig, extraNotes, version, DEFAULT_EPSILON1_HZ);
    }

    /**
     * @param run         the run folder as read
     * @param extraConfig configuration shown besides what the journal headers say (may be empty)
     * @param extraNotes  remarks shown under the checks (e.g. which process died), may be empty
     * @param version     Loopstand version of the report writer
     * @param epsilon1Hz  ε1 for CPS1 and BAAL, Hz, &gt; 0
     */
    public static ReportModel build(RunFolder run, Map<String, String> extraConfig, List<String> extraNotes, String version,
            double epsilon1Hz) {
        if (!(epsilon1Hz > 0)) {
            throw new IllegalArgumentException("epsilon1Hz must be positive, got " + epsilon1Hz);
        }
        List<JournalEntry> plant = entries(run, "plant");
        List<JournalEntry> ctl = entries(run, "controller");
        ObjectNode ph = header(run, "plant");
        ObjectNode ch = header(run, "controller");
        long start = ph != null && ph.has("startedAt") ? ph.get("startedAt").asLong() : run.startedAtMs();
        long end = Math.max(start, run.endedAtMs());
        List<AreaInfo> areas = areas(ph, plant);
        List<JournalEntry> truth = JournalSeries.ofKind(plant, "truth");
        List<JournalEntry> decided = JournalSeries.ofKind(ctl, "decided");
        List<Disturbance> disturbances = disturbances(plant, ph);

        List<String> notes = new ArrayList<>(extraNotes);
        notes.addAll(run.problems());
        endNotes(run, notes);
        if (ctl.isEmpty() && !run.journals().containsKey("controller")) {
            notes.add("No controller journal in this run folder: ACE figures are missing.");
        }
        if (areas.stream().anyMatch(a -> a.nominalHz() != 60.0)) {
            notes.add(String.format(Locale.ROOT, "CPS1 and BAAL use ε1 = %.4f Hz. NERC BAL-001-2 gives ε1 only for the North-American"
                    + " interconnections (60 Hz); for a 50 Hz area this ε1 is a configured assumption, not a standard value.",
                    epsilon1Hz));
        }

        List<Chart> charts = new ArrayList<>();
        List<MetricSection> sections = new ArrayList<>();
        List<CheckResult> checks = new ArrayList<>();
        List<TimeSeries> freq = new ArrayList<>();
        List<TimeSeries> ace = new ArrayList<>();
        List<JournalEntry> meters = plant.stream().filter(e -> e.kind().equals("published")
                && "AreaMeter".equals(e.text("type"))).toList();
        for (AreaInfo a : areas) {
            TimeSeries fTruth = JournalSeries.series(truth, e -> true,
                    e -> JournalSeries.number(e.fields(), "areas/" + a.id() + "/frequencyHz"), "f " + a.id() + " (truth)", "Hz");
            freq.add(fTruth);
            freq.add(JournalSeries.series(meters, e -> a.id().equals(e.fields().path("message").path("area").asText()),
                    e -> JournalSeries.number(e.fields(), "message/frequencyHz"), "f " + a.id() + " (meter)", "Hz"));
            TimeSeries aceA = JournalSeries.series(decided, e -> JournalSeries.element(e, "areas", "area", a.id()) != null,
                    e -> JournalSeries.number(JournalSeries.element(e, "areas", "area", a.id()), "aceMw"), "ACE " + a.id(), "MW");
            ace.add(aceA);
            ace.add(JournalSeries.series(decided, e -> JournalSeries.element(e, "areas", "area", a.id()) != null,
                    e -> JournalSeries.number(JournalSeries.element(e, "areas", "area", a.id()), "filteredAceMw"),
                    "filtered ACE " + a.id(), "MW"));
            TimeSeries ni = JournalSeries.series(truth, e -> true,
                    e -> JournalSeries.number(e.fields(), "areas/" + a.id() + "/netInterchangeMw"), "NIa " + a.id(), "MW");
            sections.add(areaSection(a, aceA, fTruth, ni, start, end, epsilon1Hz));
            for (int i = 0; i < disturbances.size(); i++) {
                Disturbance d = disturbances.get(i);
                if (!a.id().equals(d.area())) {
                    continue;
                }
                long until = i + 1 < disturbances.size() ? disturbances.get(i + 1).tMs() : Long.MAX_VALUE;
                sections.add(excursionSection(a, d, clip(fTruth, d.tMs(), until), recoveryCheck(a, d, aceA, end)));
            }
        }
        checks.addAll(journalChecks(run));
        charts.add(new Chart("Frequency", "Hz", freq, false));
        if (ace.stream().anyMatch(s -> s.size() > 0)) {
            charts.add(new Chart("ACE (NERC sign: negative = under-generation)", "MW", ace, false));
        }
        List<TimeSeries> ties = new ArrayList<>();
        for (String tie : JournalSeries.keys(truth, "ties")) {
            ties.add(JournalSeries.series(truth, e -> true, e -> JournalSeries.number(e.fields(), "ties/" + tie + "/flowMw"),
                    "tie " + tie, "MW"));
        }
        if (!ties.isEmpty()) {
            charts.add(new Chart("Tie flows (+ = export from the from-area)", "MW", ties, false));
        }
        List<TimeSeries> units = new ArrayList<>();
        for (String u : JournalSeries.keys(truth, "units")) {
            units.add(JournalSeries.series(truth, e -> true, e -> JournalSeries.number(e.fields(), "units/" + u + "/outputMw"),
                    u + " output", "MW"));
            units.add(JournalSeries.series(truth, e -> true,
                    e -> JournalSeries.number(e.fields(), "units/" + u + "/loadReferenceMw"), u + " load reference", "MW"));
        }
        if (!units.isEmpty()) {
            charts.add(new Chart("Unit output and load reference", "MW", units, false));
        }
        RunCharts.addCommandAndStateCharts(charts, plant, ctl, meters, areas, start, end);
        sections.addAll(CommunicationFigures.sections(plant, ctl, ph, (end - start) / 1000.0));

        Map<String, String> config = configuration(ph, ch, extraConfig, epsilon1Hz);
        Map<String, String> versions = new LinkedHashMap<>();
        versions.put("Loopstand (report)", version);
        if (ph != null) {
            versions.put("Loopstand (plant)", ph.path("loopstandVersion").asText("?"));
            versions.put("Java (plant)", ph.path("javaVersion").asText("?"));
        }
        versions.put("Java (report)", System.getProperty("java.version"));
        versions.put("journal schema", "1");
        String site = ph != null ? ph.path("site").asText("?") : ch != null ? ch.path("site").asText("?") : "?";
        String scenario = ph != null && ph.hasNonNull("scenario") ? ph.get("scenario").asText() : "(none)";
        String detail = String.join("; ", run.problems());
        RunInfo info = new RunInfo(run.folder().getFileName().toString(), site, scenario, start, end, run.cutShort(), detail);
        return new ReportModel(info, checks, sections, charts, RunHistograms.of(run, ctl), config, versions, notes);
    }

    private static MetricSection areaSection(AreaInfo a, TimeSeries aceA, TimeSeries f, TimeSeries ni, long start, long end,
            double eps) {
        List<Metric> m = new ArrayList<>();
        String fs = trim(a.nominalHz());
        if (aceA.size() > 0) {
            AceStatistics s = AceStatistics.of(aceA, ACE_BANDS_MW);
            m.add(Metric.of("ACE samples", s.samples(), 0, "", "controller decided entries, one per cycle"));
            m.add(Metric.of("mean ACE", s.meanMw(), 2, "MW", "controller decided areas[].aceMw"));
            m.add(Metric.of("σ ACE", s.sigmaMw(), 2, "MW", "population σ"));
            m.add(Metric.of("p50 |ACE|", s.p50AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("p90 |ACE|", s.p90AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("p99 |ACE|", s.p99AbsMw(), 2, "MW", "nearest rank"));
            m.add(Metric.of("max |ACE|", s.maxAbsMw(), 2, "MW", ""));
            for (AceStatistics.Band b : s.timeInBandS()) {
                m.add(Metric.of(String.format(Locale.ROOT, "time with |ACE| in [%s, %s) MW", trim(b.lowerAbsMw()),
                        Double.isInfinite(b.upperAbsMw()) ? "∞" : trim(b.upperAbsMw())), b.durationS(), 0, "s",
                        "zero-order hold; bands = controller quiet / assist defaults"));
            }
            if (a.betaMwPerHz() > 0) {
                double b = -a.betaMwPerHz() / 10.0;
                Cps1Calculator.Result c = Cps1Calculator.evaluate(aceA, f, a.nominalHz(), b, eps);
                m.add(Metric.of("CPS1", c.cps1Pct(), 1, "%", c.minutes() + " clock minutes, FS = " + fs + " Hz, B = "
                        + trim(b) + " MW/0.1 Hz; NERC BAL-001-2 (from memory), indicative over one run; passes at ≥ 100 %"));
                BaalEvaluator.Result br = BaalEvaluator.evaluate(aceA, f, a.nominalHz(), b, eps);
                m.add(Metric.of("BAAL exceedance minutes", br.exceedanceMinutes(), 0, "min", "clock minutes outside BAAL"));
                m.add(new Metric("BAAL longest exceedance", br.longestExceedanceMinutes() + (br.passes() ? " (pass)" : " (FAIL)"),
                        "min", "fails above 30 consecutive clock minutes; NERC BAL-001-2 (from memory)"));
                FrceStatistics fr = FrceStatistics.of(aceA, a.betaMwPerHz() * FRCE_LEVEL1_HZ, a.betaMwPerHz() * FRCE_LEVEL2_HZ);
                m.add(Metric.of("FRCE 15-min intervals", fr.intervals().size(), 0, "", "aligned quarter hours with data"));
                m.add(Metric.of("FRCE mean of 15-min means", fr.meanOfMeans(), 2, "MW", "FRCE = ACE of the area"));
                m.add(Metric.of("FRCE σ of 15-min means", fr.sigmaOfMeans(), 2, "MW", ""));
                m.add(Metric.of("FRCE share outside level 1", fr.outsideLevel1Pct(), 1, "%", String.format(Locale.ROOT,
                        "level 1 = β·%s Hz = %.0f MW (configured assumption; SOGL Annex III style, from memory)",
                        trim(FRCE_LEVEL1_HZ), a.betaMwPerHz() * FRCE_LEVEL1_HZ)));
                m.add(Metric.of("FRCE share outside level 2", fr.outsideLevel2Pct(), 1, "%", String.format(Locale.ROOT,
                        "level 2 = β·%s Hz = %.0f MW", trim(FRCE_LEVEL2_HZ), a.betaMwPerHz() * FRCE_LEVEL2_HZ)));
            }
        }
        if (f.size() > 0) {
            double min = Double.POSITIVE_INFINITY;
            double max = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < f.size(); i++) {
                min = Math.min(min, f.value(i));
                max = Math.max(max, f.value(i));
            }
            m.add(Metric.of("lowest frequency (truth)", min, 4, "Hz", "plant truth, whole run"));
            m.add(Metric.of("highest frequency (truth)", max, 4, "Hz", "plant truth, whole run"));
        }
        if (ni.size() > 1) {
            long[] t = {ni.timeMs(0), ni.timeMs(ni.size() - 1)};
            InadvertentEnergy ie = InadvertentEnergy.of(ni, new TimeSeries("NIs", "MW", t,
                    new double[] {a.scheduledNiMw(), a.scheduledNiMw()}));
            m.add(Metric.of("inadvertent energy (net)", ie.netMwh(), 3, "MWh", "∫(NIa − NIs)dt, NIa from plant truth, NIs = "
                    + trim(a.scheduledNiMw()) + " MW from the site's tie schedules"));
            m.add(Metric.of("inadvertent energy over / under", ie.overMwh(), 3, "MWh", String.format(Locale.ROOT,
                    "under: %.3f MWh", ie.underMwh())));
        }
        return new MetricSection("Area " + a.id() + ": frequency quality", MetricSection.Group.FREQUENCY_QUALITY, m);
    }

    private static MetricSection excursionSection(AreaInfo a, Disturbance d, TimeSeries f, CheckResult recovery) {
        List<Metric> m = new ArrayList<>();
        m.add(new Metric("ACE recovery (controller ACE)", recovery.decidingFigure() + (recovery.passed() ? " (within 15 min)" : " (FAIL)"),
                "", "back to min(0, ACE before) for a loss of supply, max(0, …) for a loss of load, within 900 s; "
                + recovery.source()));
        Optional<FrequencyExcursion> x = FrequencyExcursion.of(f, d.tMs(), a.nominalHz(), SETTLING_BAND_HZ);
        if (x.isPresent()) {
            m.add(Metric.of("nadir", x.get().nadirHz(), 4, "Hz", "at " + relS(x.get().nadirTimeMs(), d) + " s after the event"));
            m.add(Metric.of("zenith", x.get().zenithHz(), 4, "Hz", "at " + relS(x.get().zenithTimeMs(), d) + " s after the event"));
            OptionalDouble st = x.get().settlingTimeS();
            m.add(Metric.of("settling time", st.orElse(Double.NaN), 0, "s", "into ±" + trim(SETTLING_BAND_HZ) + " Hz of "
                    + trim(a.nominalHz()) + " Hz and staying until the next event or the end" + (st.isEmpty() ? "; did not settle" : "")));
        } else {
            m.add(new Metric("nadir", "–", "Hz", "no frequency after the event in the record"));
        }
        return new MetricSection(String.format(Locale.ROOT, "Area %s: after %s at %s s", a.id(), d.type(), trim(d.atS())),
                MetricSection.Group.FREQUENCY_QUALITY, m);
    }

    private static CheckResult recoveryCheck(AreaInfo a, Disturbance d, TimeSeries aceA, long end) {
        String name = String.format(Locale.ROOT, "ACE of %s recovered within 15 min after %s at %s s", a.id(), d.type(), trim(d.atS()));
        String source = "NERC BAL-002 (from memory)";
        if (aceA.size() == 0) {
            return new CheckResult(name, false, "no ACE in the record", "≤ 900 s", source);
        }
        double pre = aceA.valueAt(d.tMs() - 1);
        FrequencyExcursion.AceRecovery r = FrequencyExcursion.aceRecovery(aceA, d.tMs(), Double.isNaN(pre) ? 0 : pre,
                d.direction(), FrequencyExcursion.BAL002_RECOVERY_PERIOD_S);
        String figure = r.recoveryTimeS().isPresent() ? String.format(Locale.ROOT, "%.0f s (to %.1f MW)", r.recoveryTimeS().getAsDouble(),
                r.recoveryValueMw()) : String.format(Locale.ROOT, "not recovered in the %.0f s recorded after it", (end - d.tMs()) / 1000.0);
        return new CheckResult(name, r.passes(), figure, "≤ 900 s", source);
    }

    /** Checks written into a journal as {@code check} entries (name, passed, decidingFigure, limit, source). */
    static List<CheckResult> journalChecks(RunFolder run) {
        List<CheckResult> out = new ArrayList<>();
        run.journals().forEach((process, c) -> {
            for (JournalEntry e : c.entries()) {
                if (e.kind().equals("check") && e.text("name") != null) {
                    out.add(new CheckResult(e.text("name"), e.fields().path("passed").asBoolean(false),
                            e.fields().path("decidingFigure").asText("–"), e.fields().path("limit").asText("–"),
                            e.fields().path("source").asText("")));
                }
            }
        });
        return out;
    }

    private static List<Disturbance> disturbances(List<JournalEntry> plant, ObjectNode ph) {
        List<Disturbance> out = new ArrayList<>();
        JsonNode unitAreas = ph == null ? null : ph.get("units");
        for (JournalEntry e : plant) {
            if (!e.kind().equals("event") || !e.fields().has("atS")) {
                continue;
            }
            String type = e.text("event");
            double atS = e.fields().path("atS").asDouble();
            String area = e.text("area");
            FrequencyExcursion.Direction dir;
            if ("unitTrip".equals(type)) {
                String u = e.text("unit");
                area = unitAreas != null && u != null ? unitAreas.path(u).asText(null) : null;
                dir = FrequencyExcursion.Direction.LOSS_OF_SUPPLY;
            } else if (("loadStep".equals(type) || "loadRamp".equals(type)) && e.fields().has("deltaMw")) {
                dir = e.fields().path("deltaMw").asDouble() >= 0 ? FrequencyExcursion.Direction.LOSS_OF_SUPPLY
                        : FrequencyExcursion.Direction.LOSS_OF_LOAD;
            } else {
                continue;
            }
            if (area != null) {
                out.add(new Disturbance(type, atS, e.tMs(), area, dir));
            }
        }
        return out;
    }

    private static List<AreaInfo> areas(ObjectNode ph, List<JournalEntry> plant) {
        List<AreaInfo> out = new ArrayList<>();
        if (ph != null && ph.path("areas").isObject()) {
            ph.get("areas").fields().forEachRemaining(en -> out.add(new AreaInfo(en.getKey(),
                    en.getValue().path("nominalFrequencyHz").asDouble(50), en.getValue().path("betaMwPerHz").asDouble(Double.NaN),
                    en.getValue().path("scheduledNetInterchangeMw").asDouble(0))));
            return out;
        }
        for (String a : JournalSeries.keys(JournalSeries.ofKind(plant, "truth"), "areas")) {
            out.add(new AreaInfo(a, 50, Double.NaN, 0));
        }
        return out;
    }

    private static void endNotes(RunFolder run, List<String> notes) {
        run.journals().forEach((name, c) -> c.summary().endReason().ifPresent(r -> {
            if (name.equals("plant") && r == EndReason.STOPPED) {
                notes.add("The plant was stopped before the scenario's end (journal end reason: stopped).");
            }
        }));
    }

    private static Map<String, String> configuration(ObjectNode ph, ObjectNode ch, Map<String, String> extra, double eps) {
        Map<String, String> c = new LinkedHashMap<>(extra);
        if (ph != null) {
            for (String k : List.of("site", "siteFile", "scenario", "scenarioDurationS", "rate", "seed", "scenarioSeed", "broker",
                    "embeddedBroker", "grouping", "stepS", "events")) {
                if (ph.has(k) && !ph.get(k).isNull()) {
                    c.putIfAbsent("plant " + k, ph.get(k).isTextual() ? ph.get(k).asText() : ph.get(k).toString());
                }
            }
        }
        if (ch != null) {
            for (String k : List.of("controllerId", "cycleMs", "broker")) {
                if (ch.has(k)) {
                    c.putIfAbsent("controller " + k, ch.get(k).asText());
                }
            }
        }
        c.put("ε1 for CPS1/BAAL", trim(eps) + " Hz");
        c.put("settling band", "±" + trim(SETTLING_BAND_HZ) + " Hz");
        c.put("ACE bands", "[0, 5), [5, 200), [200, ∞) MW");
        return c;
    }

    static TimeSeries clip(TimeSeries s, long fromMs, long untilMs) {
        int a = 0;
        while (a < s.size() && s.timeMs(a) < fromMs) {
            a++;
        }
        int b = a;
        while (b < s.size() && s.timeMs(b) < untilMs) {
            b++;
        }
        return new TimeSeries(s.name(), s.unit(), java.util.Arrays.copyOfRange(s.tMs(), a, b),
                java.util.Arrays.copyOfRange(s.values(), a, b));
    }

    private static List<JournalEntry> entries(RunFolder run, String process) {
        JournalReader.Contents c = run.journals().get(process);
        return c == null ? List.of() : c.entries();
    }

    private static ObjectNode header(RunFolder run, String process) {
        JournalReader.Contents c = run.journals().get(process);
        return c == null ? null : c.summary().header().orElse(null);
    }

    private static String relS(long t, Disturbance d) {
        return String.format(Locale.ROOT, "%.1f", (t - d.tMs()) / 1000.0);
    }

    static String trim(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
