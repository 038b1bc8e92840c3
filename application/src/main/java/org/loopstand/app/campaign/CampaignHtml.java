package org.loopstand.app.campaign;

import static org.loopstand.report.html.Html.esc;

import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The campaign report page: one self-contained HTML file, plain styling, the chart as inline SVG.
 * Sections: summary, pass rate per check, failure rate by fault kind (chart and table), by parameter
 * range, the smallest failing combinations, failing runs and errors, each with its reproduce command.
 */
final class CampaignHtml {
    static final String CAUTION = "CAUTION: the built-in controller computes raise/lower commands. In a campaign they only reach the"
            + " emulated plant in memory; never point a controller at a live plant or a production broker without the plant's and"
            + " the grid operator's procedures. Local codes and licensed practice take precedence.";
    private static final String STYLE = "body{font-family:sans-serif;margin:2em;max-width:75em;color:#222}"
            + "table{border-collapse:collapse;margin:0.5em 0 1.5em}td,th{border:1px solid #bbb;padding:0.25em 0.6em;"
            + "text-align:left;vertical-align:top}th{background:#eee}td.n{text-align:right}.fail{color:#a00}.pass{color:#070}"
            + "code,pre{background:#f4f4f4;font-size:0.9em}pre{padding:0.5em;overflow-x:auto}.caution{border-left:4px solid #c80;"
            + "padding:0.3em 0.8em;background:#fff8e8}";

    /** Shown for a run or a shrunk combination without drawn faults or load events. */
    static final String NOTHING_DRAWN = "nothing drawn: the base scenario alone, with this random seed";

    private CampaignHtml() {
    }

    static String page(CampaignRunner.Result r, CampaignStats stats) {
        CampaignSpec spec = r.spec();
        StringBuilder h = new StringBuilder(16_384);
        h.append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\"><title>Campaign ").append(esc(spec.name()))
                .append("</title><style>").append(STYLE).append("</style></head><body>\n");
        h.append("<h1>Campaign ").append(esc(spec.name())).append("</h1>\n<p class=\"caution\">").append(esc(CAUTION)).append("</p>\n");
        h.append("<table>");
        row(h, "campaign file", spec.file().toString());
        row(h, "site", spec.siteFile().toString());
        row(h, "base scenario", spec.scenarioFile() + " (" + Distribution.format(spec.baseDurationS()) + " s)");
        row(h, "master seed", Long.toString(spec.masterSeed()));
        row(h, "runs", r.runs().size() + " in lockstep with the built-in controller, " + r.workers() + " worker"
                + (r.workers() == 1 ? "" : "s") + ", " + seconds(r.wallMs()) + " wall time (shrinking " + seconds(r.shrinkWallMs()) + ")");
        row(h, "outcome", r.count(RunResult.Status.PASS) + " passed, " + r.count(RunResult.Status.FAIL) + " failed, "
                + r.count(RunResult.Status.ERROR) + " errors");
        h.append("</table>\n");
        checks(h, stats);
        kinds(h, stats);
        ranges(h, stats);
        shrunk(h, r);
        failing(h, r);
        errors(h, r);
        h.append("<p>Summaries: <code>campaign.json</code>, <code>runs.csv</code>; each run's scenario: <code>scenarios/</code>.</p>\n");
        return h.append("</body></html>\n").toString();
    }

    private static void checks(StringBuilder h, CampaignStats stats) {
        h.append("<h2>Pass rate per check</h2>\n<table><tr><th>check</th><th>runs</th><th>passed</th><th>pass rate</th></tr>");
        for (CampaignStats.CheckRate c : stats.checkRates()) {
            h.append("<tr><td>").append(esc(c.check())).append("</td><td class=\"n\">").append(c.runs()).append("</td><td class=\"n\">")
                    .append(c.passed()).append("</td><td class=\"n ").append(c.passed() == c.runs() ? "pass" : "fail").append("\">")
                    .append(percent(c.passRate())).append("</td></tr>");
        }
        h.append("</table>\n");
    }

    private static void kinds(StringBuilder h, CampaignStats stats) {
        h.append("<h2>Failures by fault kind</h2>\n<p>Share of the runs that drew a kind (at least once) in which some check failed.</p>\n");
        h.append(chart(stats.kinds()));
        h.append("<table><tr><th>fault kind / load event</th><th>runs</th><th>failing runs</th>");
        stats.checks().forEach(c -> h.append("<th>").append(esc(c)).append(" failed</th>"));
        h.append("</tr>");
        for (CampaignStats.KindRow k : stats.kinds()) {
            h.append("<tr><td>").append(esc(k.kind())).append("</td><td class=\"n\">").append(k.runs()).append("</td>");
            cellWithShare(h, k.failingRuns(), k.runs());
            k.failsByCheck().values().forEach(n -> cellWithShare(h, n, k.runs()));
            h.append("</tr>");
        }
        h.append("</table>\n");
    }

    private static void ranges(StringBuilder h, CampaignStats stats) {
        h.append("<h2>Failures by parameter range</h2>\n<p>Each drawn number of each fault kind in ").append(CampaignStats.BINS)
                .append(" equal ranges over the values drawn; a fault counts as failing when its run failed.</p>\n");
        h.append("<table><tr><th>fault kind</th><th>parameter</th><th>range</th><th>faults</th><th>in failing runs</th><th>failing checks</th></tr>");
        for (CampaignStats.RangeRow g : stats.ranges()) {
            h.append("<tr><td>").append(esc(g.kind())).append("</td><td>").append(esc(g.parameter())).append("</td><td>")
                    .append(num(g.fromValue())).append(" – ").append(num(g.toValue())).append("</td><td class=\"n\">").append(g.faults())
                    .append("</td>");
            cellWithShare(h, g.inFailing(), g.faults());
            h.append("<td>").append(esc(failsText(g.failsByCheck()))).append("</td></tr>");
        }
        h.append("</table>\n");
    }

    private static void shrunk(StringBuilder h, CampaignRunner.Result r) {
        h.append("<h2>Smallest failing combinations</h2>\n");
        if (r.shrunk().isEmpty()) {
            h.append("<p>None: no run failed, or shrinking was off.</p>\n");
            return;
        }
        h.append("<table><tr><th>from run</th><th>check</th><th>smallest combination found</th><th>shrink runs</th><th>reproduce</th></tr>");
        for (RunResult.Shrunk s : r.shrunk()) {
            h.append("<tr><td class=\"n\">").append(s.runIndex()).append("</td><td class=\"fail\">").append(esc(s.check()))
                    .append("<br><small>").append(esc(s.outcome().toString())).append("</small></td><td>")
                    .append(lines(s.smallest().describe())).append("<small>steps: ")
                    .append(esc(s.steps().isEmpty() ? "none kept the failure" : String.join("; ", s.steps()))).append("</small></td><td class=\"n\">")
                    .append(s.runsTried()).append("</td><td><code>").append(esc(CampaignReport.reproduce(r, s))).append("</code></td></tr>");
        }
        h.append("</table>\n");
    }

    private static void failing(StringBuilder h, CampaignRunner.Result r) {
        List<RunResult> failing = r.runs().stream().filter(x -> x.status() == RunResult.Status.FAIL).toList();
        h.append("<h2>Failing runs (").append(failing.size()).append(")</h2>\n");
        if (failing.isEmpty()) {
            return;
        }
        h.append("<table><tr><th>run</th><th>seed</th><th>failing checks</th><th>drawn</th><th>reproduce</th></tr>");
        for (RunResult x : failing) {
            h.append("<tr><td class=\"n\">").append(x.plan().index()).append("</td><td class=\"n\">").append(x.plan().seed())
                    .append("</td><td class=\"fail\">").append(esc(String.join(", ", x.failingChecks()))).append("</td><td>")
                    .append(lines(x.plan().describe())).append("</td><td><code>").append(esc(CampaignReport.reproduce(r, x)))
                    .append("</code></td></tr>");
        }
        h.append("</table>\n");
    }

    private static void errors(StringBuilder h, CampaignRunner.Result r) {
        List<RunResult> errors = r.runs().stream().filter(x -> x.status() == RunResult.Status.ERROR).toList();
        h.append("<h2>Runs that threw (").append(errors.size()).append(")</h2>\n");
        for (RunResult x : errors) {
            h.append("<h3>Run ").append(x.plan().index()).append(", seed ").append(x.plan().seed()).append("</h3>\n<p><code>")
                    .append(esc(CampaignReport.reproduce(r, x))).append("</code></p>\n<pre>").append(esc(x.error())).append("</pre>\n");
        }
    }

    /** Horizontal bars: failing share of the runs that drew each kind. */
    static String chart(List<CampaignStats.KindRow> kinds) {
        int rowPx = 22;
        int labelPx = 170;
        int barPx = 360;
        int height = rowPx * kinds.size() + 24;
        StringBuilder s = new StringBuilder();
        s.append("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"").append(labelPx + barPx + 120).append("\" height=\"").append(height)
                .append("\" role=\"img\" aria-label=\"failing share of runs by fault kind\" style=\"font:12px sans-serif\">");
        for (int i = 0; i < kinds.size(); i++) {
            CampaignStats.KindRow k = kinds.get(i);
            double share = k.runs() == 0 ? 0 : (double) k.failingRuns() / k.runs();
            int y = i * rowPx + 4;
            s.append("<text x=\"").append(labelPx - 6).append("\" y=\"").append(y + 14).append("\" text-anchor=\"end\">")
                    .append(esc(k.kind())).append("</text>");
            s.append("<rect x=\"").append(labelPx).append("\" y=\"").append(y).append("\" width=\"").append(barPx)
                    .append("\" height=\"16\" fill=\"#eee\"/>");
            s.append("<rect x=\"").append(labelPx).append("\" y=\"").append(y).append("\" width=\"")
                    .append(Math.round(share * barPx)).append("\" height=\"16\" fill=\"#b33\"/>");
            s.append("<text x=\"").append(labelPx + barPx + 6).append("\" y=\"").append(y + 14).append("\">")
                    .append(percent(share)).append(" of ").append(k.runs()).append("</text>");
        }
        int axisY = kinds.size() * rowPx + 18;
        s.append("<text x=\"").append(labelPx).append("\" y=\"").append(axisY).append("\">0 %</text><text x=\"")
                .append(labelPx + barPx).append("\" y=\"").append(axisY).append("\" text-anchor=\"end\">100 % of runs failing</text>");
        return s.append("</svg>\n").toString();
    }

    private static void cellWithShare(StringBuilder h, int n, int of) {
        h.append("<td class=\"n").append(n > 0 ? " fail" : "").append("\">").append(n).append(" (")
                .append(percent(of == 0 ? Double.NaN : (double) n / of)).append(")</td>");
    }

    private static String failsText(Map<String, Integer> fails) {
        StringBuilder sb = new StringBuilder();
        fails.forEach((c, n) -> {
            if (n > 0) {
                sb.append(sb.length() == 0 ? "" : ", ").append(c).append(" ×").append(n);
            }
        });
        return sb.toString();
    }

    private static String lines(List<String> items) {
        StringBuilder sb = new StringBuilder();
        items.forEach(i -> sb.append(esc(i)).append("<br>"));
        return sb.length() == 0 ? esc(NOTHING_DRAWN) + "<br>" : sb.toString();
    }

    private static void row(StringBuilder h, String key, String value) {
        h.append("<tr><th>").append(esc(key)).append("</th><td>").append(esc(value)).append("</td></tr>");
    }

    private static String percent(double share) {
        return Double.isNaN(share) ? "n/a" : String.format(Locale.ROOT, "%.0f %%", share * 100);
    }

    private static String num(double v) {
        return v == Math.rint(v) ? Distribution.format(v) : String.format(Locale.ROOT, "%.2f", v);
    }

    private static String seconds(long ms) {
        return String.format(Locale.ROOT, "%.1f s", ms / 1000.0);
    }
}
