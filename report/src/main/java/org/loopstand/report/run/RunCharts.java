package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.TimeSeries;

/** The step charts of a run: commands the controller sent (from its journal), data quality and faults active. */
final class RunCharts {
    private RunCharts() {
    }

    static void addCommandAndStateCharts(List<Chart> charts, List<JournalEntry> plant, List<JournalEntry> ctl,
            List<JournalEntry> meters, List<RunReportBuilder.AreaInfo> areas, long start, long end) {
        List<JournalEntry> sent = JournalSeries.ofKind(ctl, "sent");
        List<JournalEntry> cycles = JournalSeries.ofKind(ctl, "decided");
        Map<String, Map<Long, Double>> byUnit = new java.util.LinkedHashMap<>();
        for (JournalEntry e : sent) {
            if (e.text("unit") != null && e.number("deltaMw").isPresent()) {
                byUnit.computeIfAbsent(e.text("unit"), k -> new HashMap<>()).merge(e.tMs(), e.number("deltaMw").getAsDouble(), Double::sum);
            }
        }
        List<TimeSeries> moves = new ArrayList<>();
        for (Map.Entry<String, Map<Long, Double>> u : byUnit.entrySet()) {
            // one value per control cycle: the move sent to the unit in that cycle, 0 when none
            moves.add(JournalSeries.series(cycles, e -> true, e -> u.getValue().getOrDefault(e.tMs(), 0.0),
                    u.getKey() + " commanded move", "MW"));
        }
        if (!moves.isEmpty()) {
            charts.add(new Chart("Commands sent: move asked of each unit per cycle (+ = raise, 0 = none)", "MW", moves, true));
        }
        List<TimeSeries> quality = new ArrayList<>();
        for (RunReportBuilder.AreaInfo a : areas) {
            quality.add(JournalSeries.series(meters, e -> a.id().equals(e.fields().path("message").path("area").asText()),
                    e -> switch (e.fields().path("message").path("frequencyQuality").path("validity").asText()) {
                        case "good" -> e.fields().path("sent").asBoolean(true) ? 2.0 : -1.0;
                        case "questionable" -> 1.0;
                        default -> 0.0;
                    }, "meter " + a.id() + " quality", ""));
        }
        quality.add(faultsActive(plant, start, end));
        charts.add(new Chart("Data quality (meter: 2 good, 1 questionable, 0 invalid, −1 not sent) and faults active",
                "code / count", quality, true));
    }

    /** Number of fault orders in force: start adds, stop (or the order's durationS) removes. */
    static TimeSeries faultsActive(List<JournalEntry> plant, long start, long end) {
        TreeMap<Long, Integer> changes = new TreeMap<>();
        Map<String, Long> startedAt = new HashMap<>();
        for (JournalEntry e : JournalSeries.ofKind(plant, "fault")) {
            String id = e.text("faultId") != null ? e.text("faultId") : e.text("orderId");
            if ("start".equals(e.text("action"))) {
                startedAt.put(id, e.tMs());
                changes.merge(e.tMs(), 1, Integer::sum);
                if (e.number("durationS").isPresent()) {
                    long stop = e.tMs() + Math.round(e.number("durationS").getAsDouble() * 1000);
                    changes.merge(stop, -1, Integer::sum);
                    startedAt.remove(id);
                }
            } else if ("stop".equals(e.text("action")) && startedAt.remove(id) != null) {
                changes.merge(e.tMs(), -1, Integer::sum);
            }
        }
        List<long[]> pts = new ArrayList<>();
        pts.add(new long[] {start, 0});
        int level = 0;
        for (Map.Entry<Long, Integer> c : changes.entrySet()) {
            level += c.getValue();
            pts.add(new long[] {Math.max(start, c.getKey()), Math.max(0, level)});
        }
        pts.add(new long[] {Math.max(end, pts.get(pts.size() - 1)[0]), Math.max(0, level)});
        long[] t = new long[pts.size()];
        double[] v = new double[pts.size()];
        for (int i = 0; i < t.length; i++) {
            t[i] = pts.get(i)[0];
            v[i] = pts.get(i)[1];
        }
        return new TimeSeries("faults active", "count", t, v);
    }
}
