package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

import com.fasterxml.jackson.databind.JsonNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.TimeSeries;

/**
 * ACE as the rig computes it from what the plant knows, for any controller: from the physics truth,
 * and from what the area meters actually put on the bus (after any injected fault). One formula for
 * both conventions, tie-line bias form:
 * {@code ACE = (NIa − NIs) + β·(Fa − Fs)}, β = K (MW/Hz, European) = −10·B (B in MW/0.1 Hz, negative,
 * North American), so a positive ACE is over-generation in either convention. NIs and Fs start at the
 * site's schedules (the plant header) and follow the scenario's {@code scheduleChange} events.
 */
final class PlantSideAce {
    /** One metered reading of an area as it went out. */
    record Reading(long tMs, double frequencyHz, double netInterchangeMw) {
    }

    /** A schedule in force from {@code fromMs}. */
    record ScheduleStep(long fromMs, double scheduledNiMw, double scheduledHz) {
    }

    private PlantSideAce() {
    }

    /** @return the schedule steps of an area: the site's at the start, then each scheduleChange event */
    static List<ScheduleStep> schedules(RunReportBuilder.AreaInfo a, List<JournalEntry> plant, long startMs) {
        List<ScheduleStep> out = new ArrayList<>();
        out.add(new ScheduleStep(Long.MIN_VALUE, a.scheduledNiMw(), a.nominalHz()));
        for (JournalEntry e : plant) {
            if (e.kind().equals("event") && "scheduleChange".equals(e.text("event")) && a.id().equals(e.text("area"))) {
                out.add(new ScheduleStep(e.tMs(), e.fields().path("scheduledNetInterchangeMw").asDouble(a.scheduledNiMw()),
                        e.fields().path("scheduledFrequencyHz").asDouble(a.nominalHz())));
            }
        }
        return out;
    }

    /** @return ACE from the truth entries of the plant journal, one point per truth sample, MW */
    static TimeSeries fromTruth(RunReportBuilder.AreaInfo a, List<JournalEntry> truth, List<ScheduleStep> schedules,
            String name) {
        List<Reading> r = new ArrayList<>();
        for (JournalEntry e : truth) {
            JsonNode area = e.fields().path("areas").path(a.id());
            if (area.has("frequencyHz") && area.has("netInterchangeMw")) {
                r.add(new Reading(e.tMs(), area.get("frequencyHz").asDouble(), area.get("netInterchangeMw").asDouble()));
            }
        }
        return ace(a, r, schedules, name);
    }

    /** @return ACE from the meter readings as they were put on the bus, MW */
    static TimeSeries fromReadings(RunReportBuilder.AreaInfo a, List<Reading> readings, List<ScheduleStep> schedules,
            String name) {
        return ace(a, readings, schedules, name);
    }

    /**
     * The meter readings of every area as they went out: a reading the plant sent as built, or, where a
     * fault stage changed it, what the fault stage sent (a dropped one is left out), in time order.
     */
    static Map<String, List<Reading>> meteredReadings(List<JournalEntry> plant) {
        // readings a fault stage acted on: its "truth" entry holds the reading as built (area + seq)
        Set<String> faulted = new HashSet<>();
        Map<String, List<Reading>> byArea = new HashMap<>();
        for (JournalEntry e : plant) {
            JsonNode rec = e.fields().path("record");
            if (!e.fields().has("stream") || !rec.has("area") || !rec.has("frequencyHz")) {
                continue;
            }
            if (e.kind().equals("truth")) {
                faulted.add(rec.path("area").asText() + "#" + rec.path("seq").asText());
            } else if (e.kind().equals("published") && "sent".equals(e.text("fate"))) {
                add(byArea, e.tMs(), rec);
            }
        }
        for (JournalEntry e : plant) {
            if (e.kind().equals("published") && "AreaMeter".equals(e.text("type")) && e.fields().path("sent").asBoolean(false)) {
                JsonNode m = e.fields().path("message");
                if (!faulted.contains(m.path("area").asText() + "#" + m.path("seq").asText())) {
                    add(byArea, e.tMs(), m);
                }
            }
        }
        byArea.values().forEach(l -> l.sort(Comparator.comparingLong(Reading::tMs)));
        return byArea;
    }

    private static void add(Map<String, List<Reading>> byArea, long tMs, JsonNode meter) {
        byArea.computeIfAbsent(meter.path("area").asText(), k -> new ArrayList<>()).add(new Reading(tMs,
                meter.path("frequencyHz").asDouble(Double.NaN), meter.path("netInterchangeMw").asDouble(Double.NaN)));
    }

    private static TimeSeries ace(RunReportBuilder.AreaInfo a, List<Reading> readings, List<ScheduleStep> schedules,
            String name) {
        long[] t = new long[readings.size()];
        double[] v = new double[readings.size()];
        int n = 0;
        for (Reading r : readings) {
            ScheduleStep s = inForce(schedules, r.tMs());
            double ace = (r.netInterchangeMw() - s.scheduledNiMw()) + a.betaMwPerHz() * (r.frequencyHz() - s.scheduledHz());
            if (Double.isFinite(ace)) {
                t[n] = r.tMs();
                v[n++] = ace;
            }
        }
        return new TimeSeries(name, "MW", java.util.Arrays.copyOf(t, n), java.util.Arrays.copyOf(v, n));
    }

    private static ScheduleStep inForce(List<ScheduleStep> schedules, long tMs) {
        ScheduleStep in = schedules.get(0);
        for (ScheduleStep s : schedules) {
            if (s.fromMs() <= tMs) {
                in = s;
            }
        }
        return in;
    }
}
