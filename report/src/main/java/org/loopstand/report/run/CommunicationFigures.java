package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.metrics.CommunicationStats;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;

/**
 * Communication figures of a run from both journals: message rates, commands and acks lost between
 * the processes (by seq), messages the plant could not send, command latency, refusals and
 * suspensions by reason.
 */
final class CommunicationFigures {
    private CommunicationFigures() {
    }

    static List<MetricSection> sections(List<JournalEntry> plant, List<JournalEntry> ctl, ObjectNode ph, double durationS) {
        List<MetricSection> out = new ArrayList<>();
        double d = Math.max(durationS, 1e-3);
        double rate = ph == null ? 1 : ph.path("rate").asDouble(1);

        Map<String, Long> publishedByType = new TreeMap<>();
        Map<String, Long> notSentByWhy = new TreeMap<>();
        long acksSentByPlant = 0;
        for (JournalEntry e : plant) {
            if (!e.kind().equals("published")) {
                continue;
            }
            if (e.fields().has("fate")) {
                // a fault stage's entry: the transport journaled the message as sent when it handed it to the stage
                // (why throughFaultStage), so only the stage knows whether it went out
                String fate = e.text("fate");
                if (!"sent".equals(fate)) {
                    String type = typeOfStream(e.text("stream"));
                    publishedByType.merge(type, -1L, Long::sum);
                    notSentByWhy.merge(type + " " + fate + " by fault " + String.join(", ", faultIds(e)), 1L, Long::sum);
                }
                continue;
            }
            if (e.fields().path("sent").asBoolean(false)) {
                publishedByType.merge(e.text("type"), 1L, Long::sum);
                if ("CommandAck".equals(e.text("type"))) {
                    acksSentByPlant++;
                }
            } else {
                notSentByWhy.merge(e.text("type") + " " + e.fields().path("why").asText("?"), 1L, Long::sum);
            }
        }
        List<JournalEntry> sent = JournalSeries.ofKind(ctl, "sent");
        long acksReceived = ctl.stream().filter(e -> e.fields().has("ack")).count();
        List<Metric> rates = new ArrayList<>();
        publishedByType.forEach((type, n) -> rates.add(Metric.of(type + " published by the plant", n / d, 2, "1/s",
                n + " messages; plant published entries with sent = true")));
        // controller-side counters only when that side reports them (its journal is in the run folder)
        boolean ctlSide = !ctl.isEmpty();
        if (ctlSide) {
            rates.add(Metric.of("commands sent by the controller", sent.size() / d, 3, "1/s", sent.size() + " commands; controller sent entries"));
            rates.add(Metric.of("acks received by the controller", acksReceived / d, 3, "1/s", acksReceived
                    + " acks answering a command it sent"));
            long acksUnknown = ctl.stream().filter(e -> e.fields().has("unknownAck")).count();
            rates.add(Metric.of("acks answering no command the controller sent", acksUnknown, 0, "",
                    "another controller's, forged or repeated acks; counted apart, never as received"));
        }
        Map<String, Long> takenByController = new TreeMap<>();
        JournalSeries.ofKind(plant, "command").stream().filter(e -> "accepted".equals(e.text("outcome")))
                .forEach(e -> takenByController.merge(String.valueOf(e.text("controllerId")), 1L, Long::sum));
        takenByController.forEach((id, n) -> rates.add(Metric.of("commands taken by the units from " + id, n, 0, "",
                "plant command entries, outcome accepted, by sending controller id")));
        if (ph != null && "insecure".equals(ph.path("security").asText())) {
            rates.add(new Metric("security", "INSECURE", "", "no broker auth, commands unsigned (plant journal header):"
                    + " any controller id above besides the rehearsed one is a third party"));
        }
        rates.add(new Metric("rates per", "scenario second", "", String.format(Locale.ROOT, "run of %.0f s at rate %s", durationS,
                RunReportBuilder.trim(rate))));
        out.add(new MetricSection("Message rates", MetricSection.Group.COMMUNICATION, rates));

        List<Metric> loss = new ArrayList<>();
        Set<Long> sentSeqs = new HashSet<>();
        sent.forEach(e -> e.number("seq").ifPresent(s -> sentSeqs.add((long) s)));
        Set<Long> arrived = new HashSet<>();
        List<String> refusals = new ArrayList<>();
        for (JournalEntry e : JournalSeries.ofKind(plant, "command")) {
            e.number("commandSeq").ifPresent(s -> arrived.add((long) s));
            if ("rejected".equals(e.text("outcome"))) {
                refusals.add(e.text("reason"));
            }
        }
        long lostCommands = sentSeqs.stream().filter(s -> !arrived.contains(s)).count();
        if (ctlSide) {
            loss.add(Metric.of("commands lost controller → plant", lostCommands, 0, "", String.format(Locale.ROOT,
                "%d sent, %d of them arrived at a plant interface (%.2f %% lost); seq of controller sent vs plant command entries",
                sentSeqs.size(), sentSeqs.size() - lostCommands, sentSeqs.isEmpty() ? 0.0 : 100.0 * lostCommands / sentSeqs.size())));
        loss.add(Metric.of("acks lost plant → controller", Math.max(0, acksSentByPlant - acksReceived), 0, "",
                acksSentByPlant + " acks published by the plant, " + acksReceived + " received by the controller"));
        }
        if (notSentByWhy.isEmpty()) {
            loss.add(new Metric("plant messages not sent", "0", "", "meter, telemetry and acks dropped at the source (link down)"));
        }
        notSentByWhy.forEach((k, n) -> loss.add(Metric.of("not sent: " + k, n, 0, "", k.contains(" by fault ")
                ? "held back by the fault stage (its published entries' fate)" : "dropped at the source, never sent late")));
        loss.addAll(DataUseFigures.loss(plant, JournalSeries.ofKind(ctl, "decided")));
        out.add(new MetricSection("Loss", MetricSection.Group.COMMUNICATION, loss));

        List<String> suspensions = new ArrayList<>();
        String previous = null; // start-up cycles before the first regulating one are no fall from regulating
        Set<String> areasOut = new HashSet<>();
        long suspendedCycles = 0;
        for (JournalEntry e : JournalSeries.ofKind(ctl, "decided")) {
            String state = e.text("state");
            if (!"regulating".equals(state)) {
                suspendedCycles++;
                if ("regulating".equals(previous)) {
                    JsonNode r = e.fields().path("reasons");
                    if (r.isArray() && r.size() > 0) {
                        r.forEach(x -> suspensions.add(x.asText()));
                    } else {
                        suspensions.add("unknown");
                    }
                }
            } else {
                // an area left out while the others regulate is a suspension of that area
                Set<String> now = new HashSet<>();
                boolean wasRegulating = "regulating".equals(previous);
                e.fields().path("suspendedAreas").forEach(a -> {
                    now.add(a.path("area").asText());
                    if (wasRegulating && !areasOut.contains(a.path("area").asText())) {
                        a.path("reasons").forEach(x -> suspensions.add(x.asText()));
                    }
                });
                areasOut.clear();
                areasOut.addAll(now);
            }
            previous = state;
        }
        List<String> intakeRefusals = new ArrayList<>();
        ctl.stream().filter(e -> e.kind().equals("refused") && e.fields().has("topic"))
                .forEach(e -> intakeRefusals.add(e.text("reason")));
        double[] latency = RunHistograms.commandLatencyMs(ctl);
        CommunicationStats cs = CommunicationStats.of(List.of(), new double[0], latency, refusals, suspensions, d);
        List<Metric> lat = new ArrayList<>();
        CommunicationStats.Spread s = cs.commandLatencyMs();
        if (ctlSide) {
            lat.add(Metric.of("command latency p50", s.p50(), 0, "ms", wallNote(s.p50(), rate) + "; controller sent → ack received, "
                    + s.count() + " commands, nearest rank"));
            lat.add(Metric.of("command latency p90", s.p90(), 0, "ms", wallNote(s.p90(), rate)));
            lat.add(Metric.of("command latency p99", s.p99(), 0, "ms", wallNote(s.p99(), rate)));
            lat.add(Metric.of("command latency max", s.max(), 0, "ms", wallNote(s.max(), rate)));
            lat.addAll(DataUseFigures.ageAtUse(plant, JournalSeries.ofKind(ctl, "decided")));
            out.add(new MetricSection("Latency, controller side (scenario ms)", MetricSection.Group.COMMUNICATION, lat));
        }

        List<Metric> reasons = new ArrayList<>();
        cs.refusalsByReason().forEach((r, n) -> reasons.add(Metric.of("command refused at the plant: " + r, n, 0, "",
                "plant command entries, outcome rejected")));
        if (cs.refusalsByReason().isEmpty()) {
            reasons.add(new Metric("commands refused at the plant", "0", "", "plant command entries"));
        }
        reasons.addAll(statusRefusals(plant));
        reasons.addAll(watchdogFallbacks(plant, ph));
        Map<String, Long> intake = new LinkedHashMap<>(JournalSeries.count(intakeRefusals));
        intake.forEach((r, n) -> reasons.add(Metric.of("input refused by the controller: " + r, n, 0, "",
                "controller refused entries (intake)")));
        cs.suspensionsByReason().forEach((r, n) -> reasons.add(Metric.of("suspension: " + r, n, 0, "",
                "times control (all areas, or one area while the others regulated) went from regulating to suspended with this reason")));
        if (ctlSide) {
            reasons.add(Metric.of("cycles not regulating", suspendedCycles, 0, "", "controller decided entries with state ≠ regulating"));
        }
        out.add(new MetricSection("Refusals and suspensions", MetricSection.Group.COMMUNICATION, reasons));
        return out;
    }

    private static String wallNote(double scenarioMs, double rate) {
        return Double.isNaN(scenarioMs) ? "" : String.format(Locale.ROOT, "≈ %.0f ms wall at rate %s", scenarioMs / rate,
                RunReportBuilder.trim(rate));
    }

    /** @return the message type a fault stage's stream carries: {@code meter/{area}/{meter}} or {@code telemetry/{unit}} */
    static String typeOfStream(String stream) {
        if (stream == null) {
            return "message";
        }
        if (stream.startsWith("meter/")) {
            return "AreaMeter";
        }
        if (stream.startsWith("telemetry/")) {
            return "UnitTelemetry";
        }
        int slash = stream.indexOf('/');
        return slash < 0 ? stream : stream.substring(0, slash);
    }

    private static List<String> faultIds(JournalEntry e) {
        List<String> ids = new ArrayList<>();
        e.fields().path("faults").forEach(f -> ids.add(f.asText()));
        return ids.isEmpty() ? List.of("?") : ids;
    }

    /**
     * Controller statuses the units refused (plant {@code event} entries {@code statusRefused}): a refused status is no
     * heartbeat, so the units' watchdog never armed on it; a unit journals each reason once per controller and watchdog
     * period, so the figure is the units that refused, not the statuses.
     */
    static List<Metric> statusRefusals(List<JournalEntry> plant) {
        Map<String, Set<String>> unitsByReason = new TreeMap<>();
        Map<String, String> example = new TreeMap<>();
        for (JournalEntry e : plant) {
            if (e.kind().equals("event") && "statusRefused".equals(e.text("event"))) {
                String reason = String.valueOf(e.text("reason"));
                unitsByReason.computeIfAbsent(reason, r -> new TreeSet<>()).add(String.valueOf(e.text("unit")));
                example.putIfAbsent(reason, e.text("unit") + ": " + e.fields().path("detail").asText(""));
            }
        }
        List<Metric> out = new ArrayList<>();
        unitsByReason.forEach((r, units) -> out.add(Metric.of("controller status refused by the units: " + r, units.size(), 0,
                "units", "not taken as a heartbeat (docs/plant.md, status checks); e.g. " + example.get(r))));
        return out;
    }

    /**
     * Units that left remote on their watchdog (plant {@code event} entries {@code watchdog}): from then on they refuse every
     * command ({@code notInRemote}) until an operator returns them, which often decides a run by itself.
     */
    static List<Metric> watchdogFallbacks(List<JournalEntry> plant, ObjectNode ph) {
        long startMs = ph == null ? Long.MIN_VALUE : ph.path("startedAt").asLong(Long.MIN_VALUE);
        Set<String> units = new TreeSet<>();
        JournalEntry first = null;
        for (JournalEntry e : plant) {
            if (e.kind().equals("event") && "watchdog".equals(e.text("event"))) {
                units.add(String.valueOf(e.text("unit")));
                first = first == null ? e : first;
            }
        }
        if (first == null) {
            return List.of();
        }
        String at = startMs == Long.MIN_VALUE ? "" : String.format(Locale.ROOT, " at %.0f s", (first.tMs() - startMs) / 1000.0);
        return List.of(Metric.of("units that left remote on their watchdog", units.size(), 0, "units", "first " + first.text("unit")
                + at + ": " + first.fields().path("detail").asText("") + "; all: " + units
                + " (they refuse commands as notInRemote until an operator returns them)"));
    }
}
