package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.TimeSeries;

/**
 * The controller's tertiary re-dispatches, from the notes of its journal's {@code decided} entries
 * ({@code redispatch:AREA:lambda=…:demandMw=…:basePointsMw={u=MW, …}} and
 * {@code redispatchInfeasible:AREA:demandMw=…:rangeMw=LO..HI}): a table and a chart of λ and base
 * points. Only a controller that journals its re-dispatches (the built-in one) has these.
 */
final class DispatchFigures {
    private static final Pattern DONE = Pattern.compile(
            "redispatch:([^:]+):lambda=([-0-9.]+):demandMw=([-0-9.]+):basePointsMw=\\{(.*)}");
    private static final Pattern INFEASIBLE = Pattern.compile(
            "redispatchInfeasible:([^:]+):demandMw=([-0-9.]+):rangeMw=([-0-9.]+)\\.\\.([-0-9.]+)");
    private static final Pattern BASE_POINT = Pattern.compile("([^=, ]+)=([-0-9.]+)");
    /** At most this many rows are listed; the rest are counted. */
    static final int MAX_ROWS = 40;

    private DispatchFigures() {
    }

    /** @return the table, or null when the controller journaled no re-dispatch */
    static MetricSection section(List<JournalEntry> decided, long startMs) {
        List<Metric> rows = new ArrayList<>();
        int more = 0;
        for (JournalEntry e : decided) {
            for (var n : e.fields().path("notes")) {
                String at = String.format(Locale.ROOT, "%.0f s", (e.tMs() - startMs) / 1000.0);
                Metric row = null;
                Matcher d = DONE.matcher(n.asText());
                Matcher i = INFEASIBLE.matcher(n.asText());
                if (d.matches()) {
                    row = new Metric(at + " " + d.group(1), "λ " + d.group(2) + " $/MWh", "",
                            "demand " + d.group(3) + " MW; base points " + d.group(4) + " MW");
                } else if (i.matches()) {
                    row = new Metric(at + " " + i.group(1), "infeasible", "", "demand " + i.group(2)
                            + " MW outside the eligible units' range " + i.group(3) + " .. " + i.group(4) + " MW");
                }
                if (row != null && rows.size() < MAX_ROWS) {
                    rows.add(row);
                } else if (row != null) {
                    more++;
                }
            }
        }
        if (rows.isEmpty()) {
            return null;
        }
        if (more > 0) {
            rows.add(new Metric("…", more + " more", "", "every re-dispatch is in controller.jsonl (decided notes)"));
        }
        return new MetricSection("Tertiary re-dispatch (the controller's economic dispatch)", MetricSection.Group.FREQUENCY_QUALITY, rows);
    }

    /** @return λ per area and the base point of each unit at each re-dispatch, or null without any */
    static Chart chart(List<JournalEntry> decided) {
        Map<String, List<double[]>> series = new TreeMap<>();
        for (JournalEntry e : decided) {
            for (var n : e.fields().path("notes")) {
                Matcher d = DONE.matcher(n.asText());
                if (!d.matches()) {
                    continue;
                }
                series.computeIfAbsent("λ " + d.group(1) + " ($/MWh)", k -> new ArrayList<>())
                        .add(new double[] {e.tMs(), Double.parseDouble(d.group(2))});
                Matcher bp = BASE_POINT.matcher(d.group(4));
                while (bp.find()) {
                    series.computeIfAbsent(bp.group(1) + " base point (MW)", k -> new ArrayList<>())
                            .add(new double[] {e.tMs(), Double.parseDouble(bp.group(2))});
                }
            }
        }
        if (series.isEmpty()) {
            return null;
        }
        List<TimeSeries> out = new ArrayList<>();
        series.forEach((name, pts) -> {
            long[] t = new long[pts.size()];
            double[] v = new double[pts.size()];
            for (int k = 0; k < t.length; k++) {
                t[k] = (long) pts.get(k)[0];
                v[k] = pts.get(k)[1];
            }
            out.add(new TimeSeries(name, name.endsWith("(MW)") ? "MW" : "$/MWh", t, v));
        });
        return new Chart("Tertiary re-dispatch: λ and base points at each re-dispatch", "MW or $/MWh", out, true);
    }
}
