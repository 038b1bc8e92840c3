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
 * state with its reasons, each unit taken out of the allocation (reason code and shortfall) and each
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
        return new MetricSection("Controller decisions as the plant saw them (state, exclusions, re-admissions)",
                MetricSection.Group.COMMUNICATION, rows);
    }

    private static String reasons(JsonNode reasons) {
        List<String> r = new ArrayList<>();
        reasons.forEach(x -> r.add(x.asText()));
        return r.isEmpty() ? "" : String.join(", ", r);
    }
}
