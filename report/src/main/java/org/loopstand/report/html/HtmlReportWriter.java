package org.loopstand.report.html;

import static org.loopstand.report.html.Html.esc;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;

/**
 * Writes a run's report as one self-contained HTML file: inline CSS and script, uPlot inlined from
 * its webjar, the chart data as inline JSON. It opens offline from the file system; nothing in it
 * points to a server. Tables are plain HTML, so the figures read without the script too.
 */
public final class HtmlReportWriter {
    /** The cautions every report carries, in order. */
    public static final List<String> CAUTIONS = List.of(
            "This tool sends raise/lower commands to generating units. Never point it at a live plant or a "
                    + "production broker outside the plant's and the grid operator's procedures.",
            "A rehearsal against an emulator is not evidence of compliance with any standard or grid code. "
                    + "CPS1, BAAL, FRCE and recovery figures here are computed over this run only, from formulas "
                    + "written down from memory (see docs/report.md), and are indicative.",
            "Local codes, the plant's and the grid operator's procedures, and licensed engineering practice "
                    + "take precedence over anything this tool does or says.");

    private static final ObjectMapper JSON = new ObjectMapper();

    private HtmlReportWriter() {
    }

    /**
     * Writes the report.
     *
     * @param model what to show
     * @param file  the HTML file to write (replaced if it exists)
     * @return {@code file}
     */
    public static Path write(ReportModel model, Path file) {
        try {
            Path parent = file.toAbsolutePath().getParent();
            if (parent != null) {
                Files.createDirectories(parent);
            }
            Files.writeString(file, render(model), StandardCharsets.UTF_8);
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write report " + file + ": " + e.getMessage(), e);
        }
    }

    /** @return the report as HTML text */
    public static String render(ReportModel model) {
        RunInfo run = model.run();
        ReportModel.Verdict verdict = model.verdict();
        StringBuilder h = new StringBuilder(256 * 1024);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>Loopstand report ").append(esc(run.runId())).append(" – ").append(verdict.label())
                .append("</title>\n");
        h.append("<!-- uPlot ").append(ReportAssets.UPLOT_VERSION).append(", bundled under its licence:\n")
                .append(ReportAssets.uplotLicense().replace("--", "- -")).append("\n-->\n");
        h.append("<style>\n").append(ReportAssets.uplotCss()).append("\n").append(ReportAssets.reportCss())
                .append("</style>\n</head>\n<body>\n");
        // A unit response report (pulse test) has its own title and headings and shows only the groups it
        // has figures for; a rehearsal report keeps its two groups, saying so when one is empty.
        boolean unitReport = model.sections().stream().anyMatch(s -> s.group() == MetricSection.Group.UNIT_RESPONSE);
        header(h, model, verdict, unitReport);
        h.append("<main>\n");
        if (run.cutShort()) {
            h.append("<p class=\"banner\" id=\"cut-short\"><strong>This run was cut short.</strong> ")
                    .append(unitReport ? "The test stopped before its programme ended. Everything below covers "
                            + "what was measured up to the stop. "
                            : "A process stopped without closing its journal (killed or crashed). Everything below "
                            + "covers the record up to the last complete journal line. ")
                    .append(esc(run.cutShortDetail())).append("</p>\n");
        }
        cautions(h);
        checks(h, model, unitReport ? "Unit response test results" : "Scenario checks");
        if (unitReport) {
            metricGroup(h, model, MetricSection.Group.UNIT_RESPONSE, "unit-response", "Unit response");
        }
        if (!unitReport || hasGroup(model, MetricSection.Group.FREQUENCY_QUALITY)) {
            metricGroup(h, model, MetricSection.Group.FREQUENCY_QUALITY, "frequency-quality", "Frequency quality");
        }
        if (!unitReport || hasGroup(model, MetricSection.Group.COMMUNICATION)) {
            metricGroup(h, model, MetricSection.Group.COMMUNICATION, "communication", "Communication");
        }
        charts(h, model);
        keyValues(h, "configuration", "Configuration", model.configuration());
        keyValues(h, "versions", "Versions", model.versions());
        h.append("<footer>Written by Loopstand. Charts drawn with uPlot ").append(ReportAssets.UPLOT_VERSION)
                .append(" (MIT licence), inlined so this file opens offline.</footer>\n</main>\n");
        h.append("<script type=\"application/json\" id=\"report-data\">").append(dataJson(model))
                .append("</script>\n");
        h.append("<script>\n").append(ReportAssets.uplotJs()).append("\n</script>\n");
        h.append("<script>\n").append(ReportAssets.reportJs()).append("\n</script>\n");
        h.append("</body>\n</html>\n");
        return h.toString();
    }

    private static void header(StringBuilder h, ReportModel model, ReportModel.Verdict verdict, boolean unitReport) {
        RunInfo run = model.run();
        h.append("<header class=\"run\">\n<div>\n<h1>")
                .append(unitReport ? "Loopstand unit response test" : "Loopstand rehearsal report")
                .append("</h1>\n<dl>\n");
        dt(h, "Run", run.runId());
        dt(h, "Site", run.site());
        dt(h, unitReport ? "Test" : "Scenario", run.scenario());
        dt(h, "Started", Instant.ofEpochMilli(run.startedAtMs()).toString()
                + (unitReport ? " (test clock, UTC)" : " (scenario time, UTC)"));
        dt(h, "Duration", String.format(Locale.ROOT, "%.1f s", run.durationS()));
        long passed = model.checks().stream().filter(CheckResult::passed).count();
        dt(h, "Checks", passed + " of " + model.checks().size() + " passed");
        h.append("</dl>\n</div>\n<div class=\"badge ").append(verdict.name().toLowerCase(Locale.ROOT).replace('_', '-'))
                .append("\" id=\"verdict\">").append(verdict.label()).append("</div>\n</header>\n");
    }

    private static void dt(StringBuilder h, String term, String value) {
        h.append("<dt>").append(esc(term)).append("</dt><dd>").append(esc(value)).append("</dd>\n");
    }

    private static void cautions(StringBuilder h) {
        h.append("<section class=\"cautions\" id=\"cautions\">\n<h2>Cautions</h2>\n<ul>\n");
        for (String c : CAUTIONS) {
            h.append("<li>").append(esc(c)).append("</li>\n");
        }
        h.append("</ul>\n</section>\n");
    }

    private static void checks(StringBuilder h, ReportModel model, String title) {
        h.append("<section id=\"checks\">\n<h2>").append(esc(title)).append("</h2>\n");
        if (model.checks().isEmpty()) {
            h.append("<p>This scenario defines no checks.</p>\n");
        } else {
            h.append("<table>\n<thead><tr><th>Check</th><th>Result</th><th>Deciding figure</th><th>Limit</th>"
                    + "<th>Source</th></tr></thead>\n<tbody>\n");
            for (CheckResult c : model.checks()) {
                String cls = c.passed() ? "pass" : "fail";
                h.append("<tr class=\"check ").append(cls).append("\"><td>").append(esc(c.name()))
                        .append("</td><td class=\"result ").append(cls).append("\">").append(c.passed() ? "PASS" : "FAIL")
                        .append("</td><td class=\"num\">").append(esc(c.decidingFigure()))
                        .append("</td><td class=\"num\">").append(esc(c.limit()))
                        .append("</td><td class=\"source\">").append(esc(c.source())).append("</td></tr>\n");
            }
            h.append("</tbody>\n</table>\n");
        }
        if (!model.notes().isEmpty()) {
            h.append("<h3>Notes</h3>\n<ul class=\"notes\">\n");
            for (String n : model.notes()) {
                h.append("<li>").append(esc(n)).append("</li>\n");
            }
            h.append("</ul>\n");
        }
        h.append("</section>\n");
    }

    private static boolean hasGroup(ReportModel model, MetricSection.Group group) {
        return model.sections().stream().anyMatch(s -> s.group() == group);
    }

    private static void metricGroup(StringBuilder h, ReportModel model, MetricSection.Group group, String id,
            String title) {
        List<MetricSection> sections = model.sections().stream().filter(s -> s.group() == group).toList();
        h.append("<section id=\"").append(id).append("\">\n<h2>").append(esc(title)).append("</h2>\n");
        if (sections.isEmpty()) {
            h.append("<p>No figures recorded.</p>\n");
        }
        h.append("<div class=\"metric-grid\">\n");
        for (MetricSection s : sections) {
            h.append("<div>\n<h3>").append(esc(s.title())).append("</h3>\n<table class=\"metrics\">\n")
                    .append("<thead><tr><th>Figure</th><th>Value</th><th>Unit</th><th>How</th></tr></thead>\n<tbody>\n");
            for (Metric m : s.metrics()) {
                h.append("<tr><td>").append(esc(m.name())).append("</td><td class=\"num\">").append(esc(m.value()))
                        .append("</td><td class=\"unit\">").append(esc(m.unit())).append("</td><td class=\"note\">")
                        .append(esc(m.note())).append("</td></tr>\n");
            }
            h.append("</tbody>\n</table>\n</div>\n");
        }
        h.append("</div>\n</section>\n");
    }

    private static void charts(StringBuilder h, ReportModel model) {
        h.append("<section id=\"charts\">\n<h2>Time series</h2>\n")
                .append("<p class=\"hint\">All charts share one time axis in seconds since the run start: the cursor "
                        + "follows across charts; drag to zoom every chart, double-click to reset.</p>\n")
                .append("<noscript><p class=\"banner\">Charts need JavaScript (inline, no network).</p></noscript>\n");
        for (int i = 0; i < model.charts().size(); i++) {
            h.append("<div class=\"chart\"><h3>").append(esc(model.charts().get(i).title()))
                    .append("</h3><div id=\"chart-").append(i).append("\"></div></div>\n");
        }
        if (!model.histograms().isEmpty()) {
            h.append("<h3>Histograms</h3>\n<div class=\"histograms\">\n");
            for (int i = 0; i < model.histograms().size(); i++) {
                h.append("<div class=\"chart\"><h3>").append(esc(model.histograms().get(i).title()))
                        .append("</h3><div id=\"histogram-").append(i).append("\"></div></div>\n");
            }
            h.append("</div>\n");
        }
        h.append("</section>\n");
    }

    private static void keyValues(StringBuilder h, String id, String title, Map<String, String> values) {
        h.append("<section id=\"").append(id).append("\">\n<h2>").append(esc(title)).append("</h2>\n");
        if (values.isEmpty()) {
            h.append("<p>None recorded.</p>\n</section>\n");
            return;
        }
        h.append("<table class=\"kv\">\n<tbody>\n");
        values.forEach((k, v) -> h.append("<tr><td>").append(esc(k)).append("</td><td>").append(esc(v))
                .append("</td></tr>\n"));
        h.append("</tbody>\n</table>\n</section>\n");
    }

    private static String dataJson(ReportModel model) {
        Map<String, Object> data = new LinkedHashMap<>();
        data.put("durationS", model.run().durationS());
        List<Object> charts = new ArrayList<>();
        model.charts().forEach(c -> charts.add(ChartData.chart(c, model.run().startedAtMs())));
        data.put("charts", charts);
        List<Object> histograms = new ArrayList<>();
        model.histograms().forEach(x -> histograms.add(ChartData.histogram(x)));
        data.put("histograms", histograms);
        try {
            // '<' only occurs inside JSON strings, where \u003c means the same: no "</script>" can appear.
            return JSON.writeValueAsString(data).replace("<", "\\u003c");
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot encode report data", e);
        }
    }
}
