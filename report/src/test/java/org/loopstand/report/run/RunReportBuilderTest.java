package org.loopstand.report.run;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.report.model.Chart;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.MetricSection;
import org.loopstand.report.model.ReportModel;

/** A small hand-made run folder: every figure below is worked out by hand from the entries written. */
class RunReportBuilderTest {
    static final long T0 = 1_767_225_600_000L; // 2026-01-01T00:00:00Z, a clock-minute boundary

    @TempDir
    Path run;

    final VirtualClock wall = new VirtualClock(T0);

    void writeRun(boolean closePlant) {
        writeRun(closePlant ? EndReason.COMPLETED : null);
    }

    /** @param plantEnd the plant journal's end reason, null: no end entry (the plant was killed) */
    void writeRun(EndReason plantEnd) {
        writeRun(plantEnd, List.of());
    }

    /** @param plantEvents further plant events, each journaled at 70 s */
    void writeRun(EndReason plantEnd, List<Map<String, Object>> plantEvents) {
        JournalWriter plant = JournalWriter.create(run.resolve("plant.jsonl"), "plant", T0, Map.of("site", "s1",
                "scenario", "trip.yaml", "rate", 10.0, "scenarioDurationS", 900.0,
                "areas", Map.of("a", Map.of("nominalFrequencyHz", 50.0, "betaMwPerHz", 500.0, "scheduledNetInterchangeMw", 0.0)),
                "units", Map.of("u1", "a")), wall, JournalWriter.DEFAULT_FLUSH_INTERVAL);
        JournalWriter ctl = JournalWriter.create(run.resolve("controller.jsonl"), "controller", T0, Map.of("controllerId", "c1"),
                wall, JournalWriter.DEFAULT_FLUSH_INTERVAL);
        for (int s = 0; s <= 120; s++) {
            double f = s < 60 ? 50.0 : s < 90 ? 49.9 : 50.0; // 100 mHz low for 30 s after the trip at 60 s
            plant.append(T0 + s * 1000L, "truth", Map.of("timeS", (double) s,
                    "areas", Map.of("a", Map.of("frequencyHz", f, "loadMw", 1000.0, "netInterchangeMw", s < 60 ? 0.0 : -10.0)),
                    "ties", Map.of(), "units", Map.of("u1", Map.of("outputMw", 100.0, "loadReferenceMw", 100.0))));
        }
        plant.append(T0 + 60_000, "event", Map.of("event", "unitTrip", "unit", "u1", "atS", 60.0));
        plantEvents.forEach(e -> plant.append(T0 + 70_000, "event", e));
        if (plantEnd == EndReason.STOPPED) { // stopped at 121 s of its 900 s: no verdict, and why
            plant.append(T0 + 121_000, "event", Map.of("event", "checksNotDecided", "reason", "stoppedBeforeEnd",
                    "stoppedAtS", 121.0, "checks", List.of("ace-recovered", "tie-back")));
        } else {
            plant.append(T0 + 121_000, "check", Map.of("name", "ace-recovered", "passed", true, "decidingFigure", "40 s",
                    "limit", "900 s", "source", "from the scenario"));
        }
        for (int k = 0; k <= 30; k++) {
            long t = T0 + k * 4_000L;
            double ace = t < T0 + 60_000 ? 0.0 : t < T0 + 100_000 ? -60.0 : 0.0; // ACE −60 MW from 60 s to 100 s
            ctl.append(t, "decided", Map.of("cycle", k, "state", "regulating", "reasons", List.of(),
                    "areas", List.of(Map.of("area", "a", "aceMw", ace, "filteredAceMw", ace, "band", "regulating"))));
        }
        ctl.append(T0 + 64_000, "sent", Map.of("unit", "u1", "seq", 1, "commandKind", "pulse", "deltaMw", 2.0));
        ctl.append(T0 + 64_250, "received", Map.of("ack", "u1", "commandSeq", 1, "outcome", "accepted"));
        plant.append(T0 + 64_100, "command", Map.of("unit", "u1", "commandSeq", 1, "outcome", "accepted"));
        ctl.close(T0 + 122_000, EndReason.STOPPED);
        if (plantEnd != null) {
            plant.close(T0 + 121_000, plantEnd);
        } else {
            plant.flush(); // the plant was killed: no end entry
        }
    }

    static Metric metric(ReportModel m, String section, String name) {
        return m.sections().stream().filter(s -> s.title().equals(section)).flatMap(s -> s.metrics().stream())
                .filter(x -> x.name().equals(name)).findFirst().orElseThrow(() -> new AssertionError("no " + section + " / " + name));
    }

    @Test
    void shouldFillChartsFiguresChecksAndCommunicationFromTheJournals() {
        writeRun(true);
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of("rate", "10"), List.of(), "test");
        assertThat(m.verdict()).isEqualTo(ReportModel.Verdict.PASS);
        assertThat(m.checks()).singleElement().satisfies(c -> assertThat(c.decidingFigure()).isEqualTo("40 s"));
        assertThat(m.charts()).extracting(Chart::title).contains("Frequency", "Unit output and load reference");
        // the controller's own ACE: 31 cycles, 10 of them (60, 64, …, 96 s) at −60 MW → mean −600/31 = −19.35 MW
        assertThat(Double.parseDouble(metric(m, "Area a: the controller's ACE against the metered ACE", "mean controller ACE")
                .value())).isCloseTo(-19.35, within(0.01));
        // the rig's ACE from truth, (NIa − 0) + 500·(f − 50): 60 samples at 0, 30 (60–89 s) at −10 − 50 = −60 MW,
        // 31 (90–120 s) at −10 MW → mean (−1800 − 310) / 121 = −17.44 MW
        assertThat(Double.parseDouble(metric(m, "Area a: frequency quality, from plant truth", "mean ACE").value()))
                .isCloseTo(-2110 / 121.0, within(0.01));
        // nadir 49.9 Hz, first seen at the trip (60 s); back in ±20 mHz at 90 s → settling 30 s
        assertThat(metric(m, "Area a: after unitTrip at 60 s", "nadir").value()).isEqualTo("49.9000");
        assertThat(metric(m, "Area a: after unitTrip at 60 s", "settling time").value()).isEqualTo("30");
        // the truth ACE stays at −10 MW after the trip (NIa −10 MW, nothing made up the lost unit): not recovered,
        // said as a figure, not as a FAIL (only the scenario's checks decide)
        assertThat(metric(m, "Area a: after unitTrip at 60 s", "ACE recovery").value()).startsWith("not recovered")
                .doesNotContain("FAIL");
        // NIa −10 MW from 60 s (trapezoid 59→60 s adds −5 MW·s) to 120 s: −(5 + 600) MW·s = −0.168 MWh
        assertThat(Double.parseDouble(metric(m, "Area a: frequency quality, from plant truth", "inadvertent energy (net)").value()))
                .isCloseTo(-605 / 3600.0, within(0.001));
        assertThat(metric(m, "Latency, controller side (scenario ms)", "command latency p50").value()).isEqualTo("250");
        assertThat(metric(m, "Loss", "commands lost controller → plant").value()).isEqualTo("0");
        assertThat(m.sections()).extracting(MetricSection::group).contains(MetricSection.Group.COMMUNICATION);
        assertThat(m.notes()).anyMatch(n -> n.contains("configured assumption"));
        assertThat(m.configuration()).containsEntry("rate", "10").containsKey("ε1 for CPS1/BAAL");
    }

    @Test
    void shouldSayWhenAndWhichChecksWereLeftUndecidedByAPlantStoppedBeforeTheScenariosEnd() {
        writeRun(EndReason.STOPPED);
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        assertThat(m.checks()).isEmpty();
        assertThat(m.notes()).contains("The plant was stopped before the scenario's end, at 121.0 s of 900 s (journal end"
                + " reason: stopped): its checks ace-recovered, tie-back were not decided (checksNotDecided, reason"
                + " stoppedBeforeEnd).");
    }

    @Test
    void shouldSayWhyThePlantStoppedItsCommandPathWatchWithTheFiguresItJournaled() {
        writeRun(EndReason.COMPLETED, List.of(Map.of("event", "paceWatchStopped", "atS", 70.0, "fromRate", 10.0,
                "toRate", 40.0, "reason", "ageNotFromPath", "cutAgeS", 20.0, "cutFromRate", 40.0, "cutToRate", 10.0,
                "youngestAgeAfterS", 19.8, "commandsAfter", 4)));
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        assertThat(m.notes()).contains("The plant's command-path watch stopped at 70.0 s of scenario time (reason"
                + " ageNotFromPath): a command 20.0 s old made it cut the rate from 40x to 10x, and the next 4 commands"
                + " were still at least 19.8 s old, so their age is in their own stamps (a controller clock behind the"
                + " plant's, or back-dated commands), not on the way; the rate went back to 40x and the commands were"
                + " judged as they came.");
        assertThat(m.verdict()).isEqualTo(ReportModel.Verdict.PASS); // a note, not a verdict of its own
    }

    @Test
    void shouldMarkTheRunCutShortWhenAJournalHasNoEnd() {
        writeRun(false);
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of("The plant process died."), "test");
        assertThat(m.verdict()).isEqualTo(ReportModel.Verdict.CUT_SHORT);
        assertThat(m.run().cutShortDetail()).contains("plant.jsonl");
        assertThat(m.notes()).contains("The plant process died.");
    }

    private static Map<String, Object> areaUse(Long frequencyAgeMs, Map<String, Long> tieAges) {
        Map<String, Object> m = new java.util.LinkedHashMap<>();
        m.put("frequencyAgeMs", frequencyAgeMs);
        m.put("tieFlowAgeMs", new java.util.LinkedHashMap<>(tieAges));
        return m;
    }

    private static Map<String, Object> unitUse(int count, Long medianMs, Long maxMs) {
        Map<String, Object> m = new java.util.LinkedHashMap<>();
        m.put("count", count);
        m.put("telemetryAgeMaxMs", maxMs);
        m.put("telemetryAgeMedianMs", medianMs);
        return m;
    }

    private static Map<String, Object> counters(long received, long missing, long gaps, long duplicates) {
        return Map.of("received", received, "rejected", 0L, "seqGaps", gaps, "seqMissing", missing,
                "duplicates", duplicates, "outOfOrder", 0L);
    }

    /**
     * Age at use and loss on a hand-made run. Plant: AreaMeter on one topic every 2 s from 0 to 20 s
     * (11 sent) and one not sent at 22 s; UnitTelemetry every 1 s from 0 to 10 s (11 sent).
     * Controller: three cycles whose used ages and intake counters are written below.
     */
    @Test
    void shouldComputeAgeOfDataAtUseAndLossPerKindFromTheControllersDecidedEntries() {
        JournalWriter plant = JournalWriter.create(run.resolve("plant.jsonl"), "plant", T0, Map.of("rate", 1.0,
                "areas", Map.of("a", Map.of("nominalFrequencyHz", 50.0, "betaMwPerHz", 500.0, "scheduledNetInterchangeMw", 0.0))),
                wall, JournalWriter.DEFAULT_FLUSH_INTERVAL);
        plant.append(T0, "truth", Map.of("timeS", 0.0, "areas", Map.of("a", Map.of("frequencyHz", 50.0, "loadMw", 1000.0,
                "netInterchangeMw", 0.0)), "ties", Map.of(), "units", Map.of()));
        JournalWriter ctl = JournalWriter.create(run.resolve("controller.jsonl"), "controller", T0, Map.of(), wall,
                JournalWriter.DEFAULT_FLUSH_INTERVAL);
        for (int s = 0; s <= 22; s++) {
            if (s % 2 == 0) {
                plant.append(T0 + s * 1000L, "published", Map.of("topic", "s1/area/a/meter/m1", "type", "AreaMeter",
                        "seq", s / 2 + 1, "sent", s <= 20));
            }
            if (s <= 10) {
                plant.append(T0 + s * 1000L, "published", Map.of("topic", "s1/unit/u1/telemetry", "type", "UnitTelemetry",
                        "seq", s + 1, "sent", true));
            }
        }
        java.util.LinkedHashMap<String, Long> t2Missing = new java.util.LinkedHashMap<>();
        t2Missing.put("t1", 1900L);
        t2Missing.put("t2", null);
        List<Map<String, Object>> used = List.of(
                Map.of("areas", Map.of("a", areaUse(100L, Map.of("t1", 100L, "t2", 300L)), "b", areaUse(700L, Map.of())),
                        "units", unitUse(2, 200L, 900L)),
                Map.of("areas", Map.of("a", areaUse(1900L, t2Missing)), "units", unitUse(2, 400L, 500L)),
                Map.of("areas", Map.of("a", areaUse(null, Map.of("t1", 50L, "t2", 2500L))), "units", unitUse(0, null, null)));
        List<Map<String, Object>> intake = List.of(
                Map.of("areaMeter", counters(2, 0, 0, 0), "unitTelemetry", counters(4, 0, 0, 0), "queueFull", 0L),
                Map.of("areaMeter", counters(5, 1, 1, 0), "unitTelemetry", counters(8, 0, 0, 0), "queueFull", 0L),
                Map.of("areaMeter", counters(10, 1, 1, 2), "unitTelemetry", counters(11, 0, 0, 0), "queueFull", 0L));
        for (int k = 0; k < 3; k++) {
            ctl.append(T0 + (k + 1) * 4_000L, "decided", Map.of("cycle", k + 1, "state", "regulating", "reasons", List.of(),
                    "areas", List.of(), "used", used.get(k), "intake", intake.get(k)));
        }
        ctl.close(T0 + 23_000, EndReason.STOPPED);
        plant.close(T0 + 23_000, EndReason.COMPLETED);

        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        String lat = "Latency, controller side (scenario ms)";
        // frequency ages 100, 700, 1900 (the null of cycle 3 was not used): p50 = rank ⌈1.5⌉ = 2 → 700,
        // p99 = rank ⌈2.97⌉ = 3 → 1900
        assertThat(metric(m, lat, "frequency age at use p50").value()).isEqualTo("700");
        assertThat(metric(m, lat, "frequency age at use p99").value()).isEqualTo("1900");
        assertThat(metric(m, lat, "frequency age at use max").value()).isEqualTo("1900");
        // meters every 2 s on one topic: scan period 2000 ms (the unsent one at 22 s does not count)
        assertThat(metric(m, lat, "frequency age at use p50").note()).startsWith("scan period 2000 ms").contains("3 values");
        // tie ages 50, 100, 300, 1900, 2500: p50 = rank 3 → 300, p99 = rank ⌈4.95⌉ = 5 → 2500
        assertThat(metric(m, lat, "tie flow age at use p50").value()).isEqualTo("300");
        assertThat(metric(m, lat, "tie flow age at use p99").value()).isEqualTo("2500");
        // unit medians 200, 400 → p50 rank 1 → 200, max 400; unit oldest 900, 500 → p50 500, max 900
        assertThat(metric(m, lat, "unit telemetry (median per cycle) age at use p50").value()).isEqualTo("200");
        assertThat(metric(m, lat, "unit telemetry (median per cycle) age at use max").value()).isEqualTo("400");
        assertThat(metric(m, lat, "unit telemetry (oldest per cycle) age at use p50").value()).isEqualTo("500");
        assertThat(metric(m, lat, "unit telemetry (oldest per cycle) age at use max").value()).isEqualTo("900");
        assertThat(metric(m, lat, "unit telemetry (oldest per cycle) age at use p50").note()).startsWith("scan period 1000 ms");
        // loss from the last counters: 1 missing / (10 received + 1) = 9.09 %; 11 sent, 10 received = 90.91 %
        assertThat(metric(m, "Loss", "AreaMeter loss on the way").value()).isEqualTo("9.09");
        assertThat(metric(m, "Loss", "AreaMeter loss on the way").note()).contains("2 duplicates");
        assertThat(metric(m, "Loss", "AreaMeter sent by the plant").value()).isEqualTo("11");
        assertThat(metric(m, "Loss", "AreaMeter received by the controller").value()).isEqualTo("10");
        assertThat(metric(m, "Loss", "AreaMeter received by the controller").note()).startsWith("90.91 %");
        assertThat(metric(m, "Loss", "UnitTelemetry loss on the way").value()).isEqualTo("0.00");
        assertThat(metric(m, "Loss", "UnitTelemetry received by the controller").note()).startsWith("100.00 %");
        assertThat(metric(m, "Loss", "not sent: AreaMeter ?").value()).isEqualTo("1");
    }
}
