package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import com.fasterxml.jackson.databind.JsonNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;

/**
 * The controller's decisions as the plant saw them in its statuses, for any controller: each change of
 * state with its reasons, each area suspended while the others regulate and its return (reasons and
 * figures), each unit taken out of the allocation (reason code and shortfall) and each
 * re-admission, in time order.
 */
final class ControllerDecisions {
    /** At most this many rows are listed; the rest are counted. */
    static final int MAX_ROWS = 60;

    private ControllerDecisions() {
    }

    static MetricSection section(List<JournalEntry> plant, long startMs) {
        List<Metric> rows = new ArrayList<>();
        int more = 0;
        String lastState = null;
        Map<String, JsonNode> excluded = new LinkedHashMap<>();
        Map<String, JsonNode> areasOut = new LinkedHashMap<>();
        for (JournalEntry e : JournalSeries.ofKind(plant, "controllerStatus")) {
            String at = String.format(Locale.ROOT, "%.0f s", (e.tMs() - startMs) / 1000.0);
            List<String> lines = new ArrayList<>();
            List<String> notes = new ArrayList<>();
            String state = e.text("state") + reasons(e.fields().path("reasons"));
            if (!state.equals(lastState)) {
                lines.add(e.text("controllerId") + " " + e.text("state"));
                notes.add(reasons(e.fields().path("reasons")).isEmpty() ? "" : "reasons " + reasons(e.fields().path("reasons")));
                lastState = state;
            }
            Map<String, JsonNode> now = new LinkedHashMap<>();
            e.fields().path("excludedUnits").forEach(x -> now.put(x.path("unit").asText(), x));
            for (Map.Entry<String, JsonNode> x : now.entrySet()) {
                if (!excluded.containsKey(x.getKey())) {
                    lines.add(x.getKey() + " excluded");
                    notes.add(String.format(Locale.ROOT, "reason %s, shortfall %.2f MW, area %s", x.getValue().path("reason").asText(),
                            x.getValue().path("shortfallMw").asDouble(), x.getValue().path("area").asText()));
                }
            }
            for (String u : excluded.keySet()) {
                if (!now.containsKey(u)) {
                    lines.add(u + " re-admitted");
                    notes.add("after " + excluded.get(u).path("reason").asText());
                }
            }
            excluded = now;
            areasOut = areaChanges(e, areasOut, lines, notes);
            for (int i = 0; i < lines.size(); i++) {
                if (rows.size() < MAX_ROWS) {
                    rows.add(new Metric(at, lines.get(i), "", notes.get(i)));
                } else {
                    more++;
                }
            }
        }
        if (rows.isEmpty()) {
            rows.add(new Metric("decisions", "not measured", "", "no controller status reached the plant"));
        }
        if (more > 0) {
            rows.add(new Metric("…", more + " more", "", "every status is in plant.jsonl (controllerStatus)"));
        }
        return new MetricSection("Controller decisions as the plant saw them (state, area suspensions, exclusions, re-admissions)",
                MetricSection.Group.COMMUNICATION, rows);
    }

    /**
     * Areas suspended while the controller regulated the others: a row when one is left out and when it
     * is back. While the whole controller is suspended its state row says it all.
     */
    private static Map<String, JsonNode> areaChanges(JournalEntry e, Map<String, JsonNode> before, List<String> lines,
                                                     List<String> notes) {
        Map<String, JsonNode> now = new LinkedHashMap<>();
        if (!"regulating".equals(e.text("state"))) {
            return now;
        }
        e.fields().path("suspendedAreas").forEach(x -> now.put(x.path("area").asText(), x));
        for (Map.Entry<String, JsonNode> x : now.entrySet()) {
            if (!before.containsKey(x.getKey())) {
                lines.add("area " + x.getKey() + " suspended");
                notes.add("reasons " + reasons(x.getValue().path("reasons")) + "; " + x.getValue().path("detail").asText());
            }
        }
        for (String a : before.keySet()) {
            if (!now.containsKey(a)) {
                lines.add("area " + a + " resumed");
                notes.add("after " + reasons(before.get(a).path("reasons")));
            }
        }
        return now;
    }

    private static String reasons(JsonNode reasons) {
        List<String> r = new ArrayList<>();
        reasons.forEach(x -> r.add(x.asText()));
        return r.isEmpty() ? "" : String.join(", ", r);
    }
}
