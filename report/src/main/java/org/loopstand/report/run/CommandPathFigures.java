package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;

import com.fasterxml.jackson.databind.JsonNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.metrics.Percentiles;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.TimeSeries;

/**
 * The command path as the plant saw it, for any controller: commands received per unit and per
 * second, accepted and refused by reason (with one example each), pulses executed, expiry margin at
 * arrival, issue-to-arrival latency, the controller's cycle and heartbeat as seen on the wire, commands
 * that arrived while the area's metered data were stale, and moves against the truth ACE. Every figure
 * comes from the plant journal ({@code command} and {@code controllerStatus} entries); docs/report.md
 * lists them.
 */
final class CommandPathFigures {
    /** Metered data older than this many scan periods at a command's arrival count as stale (docs/report.md). */
    static final double STALE_SCAN_PERIODS = 2.5;
    /** This many consecutive metered readings with the very same values count as frozen. */
    static final int FROZEN_READINGS = 3;
    /** A move against the truth ACE counts only beyond this |ACE|, MW, or β·{@value #WRONG_WAY_HZ} Hz if larger. */
    static final double WRONG_WAY_MIN_MW = 10;
    static final double WRONG_WAY_HZ = 0.01;

    private CommandPathFigures() {
    }

    /** What the command figures need of each area. */
    record AreaView(RunReportBuilder.AreaInfo info, TimeSeries truthAce, List<PlantSideAce.Reading> metered) {
    }

    static MetricSection section(List<JournalEntry> plant, Map<String, String> unitAreas, Map<String, AreaView> areas,
            double durationS, double meterScanS) {
        List<JournalEntry> commands = JournalSeries.ofKind(plant, "command");
        List<Metric> m = new ArrayList<>();
        Map<String, Long> perUnit = new TreeMap<>();
        Map<String, Long> refusedByReason = new TreeMap<>();
        Map<String, String> exampleByReason = new LinkedHashMap<>();
        List<Double> marginMs = new ArrayList<>();
        List<Double> latencyMs = new ArrayList<>();
        long accepted = 0;
        long pulses = 0;
        double pulseS = 0;
        long staleAtArrival = 0;
        long wrongWay = 0;
        long judgedMoves = 0;
        for (JournalEntry e : commands) {
            String unit = e.text("unit");
            perUnit.merge(unit == null ? "?" : unit, 1L, Long::sum);
            JsonNode f = e.fields();
            if (f.path("validUntil").asLong(0) > 0) {
                marginMs.add((double) (f.path("validUntil").asLong() - e.tMs()));
            }
            if (f.path("issuedAt").asLong(0) > 0) {
                latencyMs.add((double) (e.tMs() - f.path("issuedAt").asLong()));
            }
            if (!"accepted".equals(e.text("outcome"))) {
                String reason = e.text("reason") == null ? "unknown" : e.text("reason");
                refusedByReason.merge(reason, 1L, Long::sum);
                exampleByReason.putIfAbsent(reason, (unit == null ? "" : unit + ": ") + (e.text("detail") == null ? "" : e.text("detail")));
                continue;
            }
            accepted++;
            if ("pulse".equals(e.text("commandKind"))) {
                pulses++;
                pulseS += f.path("durationMs").asDouble(0) / 1000.0;
            }
            AreaView a = unitAreas.get(unit) == null ? null : areas.get(unitAreas.get(unit));
            if (a == null) {
                continue;
            }
            if (isStaleOrFrozen(a.metered(), e.tMs(), meterScanS)) {
                staleAtArrival++;
            }
            double move = f.path("loadReferenceAfterMw").asDouble(Double.NaN) - f.path("loadReferenceBeforeMw").asDouble(Double.NaN);
            double ace = a.truthAce().valueAt(e.tMs());
            double tol = Math.max(WRONG_WAY_MIN_MW, a.info().betaMwPerHz() * WRONG_WAY_HZ);
            if (Double.isFinite(move) && move != 0 && Double.isFinite(ace)) {
                judgedMoves++;
                if ((ace > tol && move > 0) || (ace < -tol && move < 0)) {
                    wrongWay++;
                }
            }
        }
        m.add(Metric.of("commands received", commands.size(), 0, "", String.format(Locale.ROOT, "%.3f per scenario s; per unit: %s",
                commands.size() / Math.max(durationS, 1e-3), perUnit)));
        m.add(Metric.of("commands accepted", accepted, 0, "", "by the unit plant interfaces"));
        m.add(Metric.of("pulses executed", pulses, 0, "", String.format(Locale.ROOT, "%.1f s of pulses in all", pulseS)));
        long refused = commands.size() - accepted;
        m.add(Metric.of("commands refused", refused, 0, "", refused == 0 ? "none" : "by reason below"));
        refusedByReason.forEach((r, n) -> m.add(Metric.of("refused: " + r, n, 0, "", "e.g. " + exampleByReason.get(r))));
        double[] margins = toArray(marginMs);
        m.add(Metric.of("expiry margin at arrival p50", Percentiles.nearestRank(margins, 50), 0, "ms", "validUntil − arrival at the unit"));
        m.add(Metric.of("expiry margin at arrival min", min(margins), 0, "ms", "negative = arrived expired"));
        double[] lat = toArray(latencyMs);
        m.add(Metric.of("issue to arrival p50", Percentiles.nearestRank(lat, 50), 0, "ms", "arrival at the unit − issuedAt (scenario time)"));
        m.add(Metric.of("issue to arrival p99", Percentiles.nearestRank(lat, 99), 0, "ms", ""));
        m.add(Metric.of("commands on stale or frozen metered data", staleAtArrival, 0, "", String.format(Locale.ROOT,
                "accepted commands that arrived when the unit's area meter had put nothing on the bus for %.1f scan periods"
                + " (%.1f s) or had sent the very same values %d times running", STALE_SCAN_PERIODS, STALE_SCAN_PERIODS * meterScanS,
                FROZEN_READINGS)));
        m.add(Metric.of("moves against the truth ACE", wrongWay, 0, "", String.format(Locale.ROOT,
                "of %d accepted moves: a raise while the area's truth ACE was above +max(%.0f MW, β·%.2f Hz), or a lower below its negative",
                judgedMoves, WRONG_WAY_MIN_MW, WRONG_WAY_HZ)));
        heartbeat(plant, m);
        return new MetricSection("Command path as the plant saw it", MetricSection.Group.COMMUNICATION, m);
    }

    /** Cycle period, jitter and heartbeat gaps from the controller statuses the plant received. */
    private static void heartbeat(List<JournalEntry> plant, List<Metric> m) {
        List<JournalEntry> st = JournalSeries.ofKind(plant, "controllerStatus");
        if (st.size() < 3) {
            m.add(new Metric("controller cycle period", "not measured", "s", "fewer than 3 controller statuses reached the plant"));
            return;
        }
        double[] gaps = new double[st.size() - 1];
        double[] sourceGaps = new double[st.size() - 1];
        for (int i = 1; i < st.size(); i++) {
            gaps[i - 1] = (st.get(i).tMs() - st.get(i - 1).tMs()) / 1000.0;
            sourceGaps[i - 1] = (st.get(i).fields().path("sourceTime").asLong() - st.get(i - 1).fields().path("sourceTime").asLong()) / 1000.0;
        }
        double period = Percentiles.nearestRank(sourceGaps, 50);
        double[] dev = new double[sourceGaps.length];
        for (int i = 0; i < dev.length; i++) {
            dev[i] = Math.abs(sourceGaps[i] - period);
        }
        m.add(Metric.of("controller cycle period", period, 2, "s", "median interval of the statuses' sourceTime"));
        m.add(Metric.of("controller cycle jitter p99", Percentiles.nearestRank(dev, 99) * 1000, 0, "ms", "|interval − median|"));
        m.add(Metric.of("longest heartbeat gap", max(gaps), 1, "s", st.size() + " statuses received by the plant; units fall back after their watchdog"));
    }

    /** Step chart: load reference move of each accepted command, per unit, at its arrival. */
    static Chart movesChart(List<JournalEntry> plant) {
        Map<String, List<double[]>> byUnit = new TreeMap<>();
        for (JournalEntry e : JournalSeries.ofKind(plant, "command")) {
            double move = e.fields().path("loadReferenceAfterMw").asDouble(Double.NaN) - e.fields().path("loadReferenceBeforeMw").asDouble(Double.NaN);
            if ("accepted".equals(e.text("outcome")) && Double.isFinite(move)) {
                byUnit.computeIfAbsent(e.text("unit"), k -> new ArrayList<>()).add(new double[] {e.tMs(), move});
            }
        }
        List<TimeSeries> series = new ArrayList<>();
        byUnit.forEach((u, pts) -> {
            long[] t = new long[pts.size()];
            double[] v = new double[pts.size()];
            for (int i = 0; i < t.length; i++) {
                t[i] = (long) pts.get(i)[0];
                v[i] = pts.get(i)[1];
            }
            series.add(new TimeSeries(u + " move", "MW", t, v));
        });
        return series.isEmpty() ? null : new Chart("Commands received: load reference move of each accepted command (+ = raise)",
                "MW", series, false);
    }

    /**
     * @return true when, at {@code tMs}, the area's last metered reading was older than
     *         {@link #STALE_SCAN_PERIODS} scans, or the last {@value #FROZEN_READINGS} readings carried the
     *         very same frequency and interchange (a frozen meter: real readings always move a little)
     */
    static boolean isStaleOrFrozen(List<PlantSideAce.Reading> metered, long tMs, double scanS) {
        // the last reading at or before tMs (readings are in time order): binary search, not a scan per command
        int lo = 0;
        int hi = metered.size() - 1;
        int i = -1;
        while (lo <= hi) {
            int mid = (lo + hi) >>> 1;
            if (metered.get(mid).tMs() <= tMs) {
                i = mid;
                lo = mid + 1;
            } else {
                hi = mid - 1;
            }
        }
        if (i < 0 || tMs - metered.get(i).tMs() > STALE_SCAN_PERIODS * scanS * 1000) {
            return true;
        }
        if (i + 1 < FROZEN_READINGS) {
            return false;
        }
        PlantSideAce.Reading last = metered.get(i);
        for (int k = i - FROZEN_READINGS + 1; k < i; k++) {
            PlantSideAce.Reading r = metered.get(k);
            if (r.frequencyHz() != last.frequencyHz() || r.netInterchangeMw() != last.netInterchangeMw()) {
                return false;
            }
        }
        return true;
    }

    private static double[] toArray(List<Double> l) {
        return l.stream().mapToDouble(Double::doubleValue).toArray();
    }

    private static double min(double[] v) {
        return v.length == 0 ? Double.NaN : java.util.Arrays.stream(v).min().getAsDouble();
    }

    private static double max(double[] v) {
        return v.length == 0 ? Double.NaN : java.util.Arrays.stream(v).max().getAsDouble();
    }
}
