package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;

import com.fasterxml.jackson.databind.JsonNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.metrics.Percentiles;
import org.loopstand.report.model.Metric;

/**
 * Age of data at use and meter/telemetry loss, from the controller's {@code decided} entries
 * ({@code used} and {@code intake} fields) and the plant's {@code published} entries.
 *
 * <ul>
 *   <li>Age at use per kind: frequency and tie flow = every area's (every tie's) age in every cycle;
 *       unit telemetry = the per-cycle median and the per-cycle oldest over the units used. p50 / p99 /
 *       max by nearest rank, scenario ms. Beside it the scan period: median spacing of the plant's sent
 *       publications of that type on the same topic.</li>
 *   <li>Loss per kind = seq missing / (received + seq missing), from the last {@code intake} counters.
 *       Also sent by the plant ({@code published}, sent = true) against received by the controller.</li>
 * </ul>
 */
final class DataUseFigures {
    /** Controller counter key ↔ plant published type. */
    private static final Map<String, String> KINDS = Map.of("areaMeter", "AreaMeter", "unitTelemetry", "UnitTelemetry");

    private DataUseFigures() {
    }

    static List<Metric> ageAtUse(List<JournalEntry> plant, List<JournalEntry> decided) {
        List<Double> freq = new ArrayList<>();
        List<Double> tie = new ArrayList<>();
        List<Double> unitMedian = new ArrayList<>();
        List<Double> unitMax = new ArrayList<>();
        for (JournalEntry e : decided) {
            JsonNode used = e.fields().path("used");
            for (Iterator<JsonNode> it = used.path("areas").elements(); it.hasNext(); ) {
                JsonNode a = it.next();
                addIfNumber(freq, a.path("frequencyAgeMs"));
                a.path("tieFlowAgeMs").elements().forEachRemaining(t -> addIfNumber(tie, t));
            }
            addIfNumber(unitMedian, used.path("units").path("telemetryAgeMedianMs"));
            addIfNumber(unitMax, used.path("units").path("telemetryAgeMaxMs"));
        }
        Map<String, Double> scan = scanPeriodsMs(plant);
        List<Metric> out = new ArrayList<>();
        spread(out, "frequency", freq, scan.get("AreaMeter"), "AreaMeter");
        spread(out, "tie flow", tie, scan.get("AreaMeter"), "AreaMeter");
        spread(out, "unit telemetry (median per cycle)", unitMedian, scan.get("UnitTelemetry"), "UnitTelemetry");
        spread(out, "unit telemetry (oldest per cycle)", unitMax, scan.get("UnitTelemetry"), "UnitTelemetry");
        return out;
    }

    static List<Metric> loss(List<JournalEntry> plant, List<JournalEntry> decided) {
        JsonNode intake = null;
        for (JournalEntry e : decided) {
            if (e.fields().has("intake")) {
                intake = e.fields().get("intake");
            }
        }
        Map<String, Long> sentByType = new TreeMap<>();
        for (JournalEntry e : plant) {
            if (e.kind().equals("published") && e.fields().path("sent").asBoolean(false)) {
                sentByType.merge(e.text("type"), 1L, Long::sum);
            }
        }
        List<Metric> out = new ArrayList<>();
        if (intake == null) {
            out.add(new Metric("meter / telemetry loss on the way", "–", "",
                    "the controller journal has no intake counters (decided entries without an intake field)"));
            return out;
        }
        for (String kind : List.of("areaMeter", "unitTelemetry")) {
            String type = KINDS.get(kind);
            JsonNode c = intake.path(kind);
            long received = c.path("received").asLong();
            long missing = c.path("seqMissing").asLong();
            long sent = sentByType.getOrDefault(type, 0L);
            out.add(Metric.of(type + " sent by the plant", sent, 0, "", "plant published entries with sent = true"));
            out.add(Metric.of(type + " received by the controller", received, 0, "", String.format(Locale.ROOT,
                    "%s of sent; controller intake counters as of its last cycle (later messages not included)",
                    sent == 0 ? "–" : String.format(Locale.ROOT, "%.2f %%", 100.0 * received / sent))));
            double lossPct = received + missing == 0 ? Double.NaN : 100.0 * missing / (received + missing);
            out.add(Metric.of(type + " loss on the way", lossPct, 2, "%", String.format(Locale.ROOT,
                    "seq missing / (received + seq missing) = %d / (%d + %d); %d gaps, %d duplicates, %d out of order,"
                            + " %d rejected by the intake; seqs of the sources the intake tracks (primary meters)",
                    missing, received, missing, c.path("seqGaps").asLong(), c.path("duplicates").asLong(),
                    c.path("outOfOrder").asLong(), c.path("rejected").asLong())));
        }
        out.add(Metric.of("intake queue overflow", intake.path("queueFull").asLong(), 0, "", "messages dropped with a full"
                + " intake queue (queueFull), any kind"));
        return out;
    }

    /** @return per published type, the median spacing of sent publications on one topic, scenario ms */
    static Map<String, Double> scanPeriodsMs(List<JournalEntry> plant) {
        Map<String, Long> lastByTopic = new TreeMap<>();
        Map<String, List<Double>> spacing = new TreeMap<>();
        for (JournalEntry e : plant) {
            if (!e.kind().equals("published") || !e.fields().path("sent").asBoolean(false)) {
                continue;
            }
            String type = e.text("type");
            String topic = e.text("topic");
            if (type == null || topic == null || e.fields().has("faults")) {
                continue;
            }
            Long last = lastByTopic.put(topic, e.tMs());
            if (last != null) {
                spacing.computeIfAbsent(type, k -> new ArrayList<>()).add((double) (e.tMs() - last));
            }
        }
        Map<String, Double> out = new TreeMap<>();
        spacing.forEach((type, d) -> out.put(type, Percentiles.nearestRank(toArray(d), 50)));
        return out;
    }

    private static void spread(List<Metric> out, String name, List<Double> ages, Double scanMs, String type) {
        double[] v = toArray(ages);
        String scan = scanMs == null ? "scan period unknown (no " + type + " published)"
                : String.format(Locale.ROOT, "scan period %.0f ms (median spacing of plant %s per topic)", scanMs, type);
        out.add(Metric.of(name + " age at use p50", Percentiles.nearestRank(v, 50), 0, "ms",
                scan + "; " + v.length + " values from controller decided used, nearest rank"));
        out.add(Metric.of(name + " age at use p99", Percentiles.nearestRank(v, 99), 0, "ms", scan));
        out.add(Metric.of(name + " age at use max", Percentiles.nearestRank(v, 100), 0, "ms", scan));
    }

    private static void addIfNumber(List<Double> out, JsonNode n) {
        if (n != null && n.isNumber()) {
            out.add(n.asDouble());
        }
    }

    private static double[] toArray(List<Double> values) {
        return values.stream().mapToDouble(Double::doubleValue).toArray();
    }
}
