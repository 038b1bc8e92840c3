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
import org.loopstand.report.model.CheckMargin;
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
        // units that ran as processes of their own journal their part of the plant side beside plant.jsonl
        List<JournalEntry> plant = run.plantSideEntries();
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
        run.skipped().forEach(f -> notes.add("Skipped in the run folder: " + f + "."));
        notes.addAll(PlantDecisionNotes.of(run));
        if (ctl.isEmpty() && !run.journals().containsKey("controller")) {
            notes.add("No controller journal in this run folder: every figure comes from the plant side; the controller's"
                    + " own counters (acks received, data age at use, its decisions) are not shown.");
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
        Map<String, List<PlantSideAce.Reading>> metered = PlantSideAce.meteredReadings(plant);
        Map<String, CommandPathFigures.AreaView> views = new LinkedHashMap<>();
        List<MetricSection> comparisons = new ArrayList<>();
        for (AreaInfo a : areas) {
            TimeSeries fTruth = JournalSeries.series(truth, e -> e.fields().has("areas"),
                    e -> JournalSeries.number(e.fields(), "areas/" + a.id() + "/frequencyHz"), "f " + a.id() + " (truth)", "Hz");
            List<PlantSideAce.Reading> readings = metered.getOrDefault(a.id(), List.of());
            TimeSeries fMetered = readingSeries(readings, "f " + a.id() + " (metered)");
            freq.add(fTruth);
            freq.add(fMetered);
            List<PlantSideAce.ScheduleStep> schedules = PlantSideAce.schedules(a, plant, start);
            TimeSeries aceTruth = PlantSideAce.fromTruth(a, truth, schedules, "ACE " + a.id() + " (truth)");
            TimeSeries aceMetered = PlantSideAce.fromReadings(a, readings, schedules, "ACE " + a.id() + " (metered)");
            TimeSeries aceController = controllerAce(a, decided, plant);
            ace.add(aceTruth);
            ace.add(aceMetered);
            if (aceController.size() > 0) {
                ace.add(aceController);
            }
            views.put(a.id(), new CommandPathFigures.AreaView(a, aceTruth, readings));
            TimeSeries ni = JournalSeries.series(truth, e -> e.fields().has("areas"),
                    e -> JournalSeries.number(e.fields(), "areas/" + a.id() + "/netInterchangeMw"), "NIa " + a.id(), "MW");
            sections.add(AreaFigures.quality(a, aceTruth, fTruth, ni, epsilon1Hz, "from plant truth"));
            sections.add(AreaFigures.quality(a, aceMetered, fMetered, null, epsilon1Hz, "from the meters as published"));
            if (aceController.size() > 0) {
                String source = decided.isEmpty() ? "the controller's statuses as the plant received them" : "the controller journal";
                comparisons.add(new MetricSection("Area " + a.id() + ": the controller's ACE against the metered ACE",
                        MetricSection.Group.FREQUENCY_QUALITY, ControllerAceComparison.of(aceController, aceMetered,
                        a.betaMwPerHz()).metrics(source)));
            }
            for (int i = 0; i < disturbances.size(); i++) {
                Disturbance d = disturbances.get(i);
                if (!a.id().equals(d.area())) {
                    continue;
                }
                long until = i + 1 < disturbances.size() ? disturbances.get(i + 1).tMs() : Long.MAX_VALUE;
                sections.add(AreaFigures.excursion(a, d, clip(fTruth, d.tMs(), until), aceTruth, end));
            }
        }
        sections.addAll(comparisons);
        checks.addAll(journalChecks(run));
        checks.stream().filter(CheckMargin::near).forEach(c -> notes.add("Check " + CheckMargin.describe(c) + "."));
        if (!freq.isEmpty()) {
            charts.add(new Chart("Frequency", "Hz", freq, false));
        }
        if (ace.stream().anyMatch(s -> s.size() > 0)) {
            charts.add(new Chart("ACE: truth, as metered and the controller's (+ = over-generation)", "MW", ace, false));
        }
        List<TimeSeries> ties = new ArrayList<>();
        for (String tie : JournalSeries.keys(truth, "ties")) {
            ties.add(JournalSeries.series(truth, e -> e.fields().has("ties"), e -> JournalSeries.number(e.fields(), "ties/" + tie + "/flowMw"),
                    "tie " + tie, "MW"));
        }
        if (!ties.isEmpty()) {
            charts.add(new Chart("Tie flows (+ = export from the from-area)", "MW", ties, false));
        }
        List<TimeSeries> units = new ArrayList<>();
        for (String u : JournalSeries.keys(truth, "units")) {
            units.add(JournalSeries.series(truth, e -> e.fields().has("units"), e -> JournalSeries.number(e.fields(), "units/" + u + "/outputMw"),
                    u + " output", "MW"));
            units.add(JournalSeries.series(truth, e -> e.fields().has("units"),
                    e -> JournalSeries.number(e.fields(), "units/" + u + "/loadReferenceMw"), u + " load reference", "MW"));
        }
        if (!units.isEmpty()) {
            charts.add(new Chart("Unit output and load reference", "MW", units, false));
        }
        Chart moves = CommandPathFigures.movesChart(plant);
        if (moves != null) {
            charts.add(moves);
        }
        Chart states = ControllerStates.chart(plant);
        if (states != null) {
            charts.add(states);
        }
        Map<String, String> unitAreas = new LinkedHashMap<>();
        if (ph != null) {
            ph.path("units").fields().forEachRemaining(en -> unitAreas.put(en.getKey(), en.getValue().asText()));
        }
        sections.add(CommandPathFigures.section(plant, unitAreas, views, (end - start) / 1000.0, meterScanS(ph)));
        sections.add(ControllerDecisions.section(plant, start));
        MetricSection dispatch = DispatchFigures.section(decided, start);
        if (dispatch != null) {
            sections.add(dispatch);
            charts.add(DispatchFigures.chart(decided));
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

    /** The controller's ACE of an area: its journal's decided entries if present, else its statuses as the plant got them. */
    private static TimeSeries controllerAce(AreaInfo a, List<JournalEntry> decided, List<JournalEntry> plant) {
        String name = "ACE " + a.id() + " (controller)";
        if (!decided.isEmpty()) {
            return JournalSeries.series(decided, e -> JournalSeries.element(e, "areas", "area", a.id()) != null,
                    e -> JournalSeries.number(JournalSeries.element(e, "areas", "area", a.id()), "aceMw"), name, "MW");
        }
        return JournalSeries.series(JournalSeries.ofKind(plant, "controllerStatus"),
                e -> e.fields().path("areas").has(a.id()),
                e -> JournalSeries.number(e.fields(), "areas/" + a.id() + "/aceMw"), name, "MW");
    }

    private static TimeSeries readingSeries(List<PlantSideAce.Reading> readings, String name) {
        long[] t = new long[readings.size()];
        double[] v = new double[readings.size()];
        for (int i = 0; i < t.length; i++) {
            t[i] = readings.get(i).tMs();
            v[i] = readings.get(i).frequencyHz();
        }
        return new TimeSeries(name, "Hz", t, v);
    }

    /** The meters' scan period from the plant header, s (2 s, the plant's default, when the header has none). */
    private static double meterScanS(ObjectNode ph) {
        return ph == null ? 2.0 : ph.path("meterScanMs").asDouble(2000) / 1000.0;
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

    static String trim(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
