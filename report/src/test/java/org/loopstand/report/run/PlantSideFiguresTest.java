package org.loopstand.report.run;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.report.model.Metric;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.TimeSeries;

/**
 * The figures the rig computes for any controller from the plant journal alone (no controller
 * journal in the folder), on a hand-made run whose every value is worked out below.
 */
class PlantSideFiguresTest {
    static final long T0 = 1_767_225_600_000L;

    @TempDir
    Path run;

    final VirtualClock wall = new VirtualClock(T0);

    static Map<String, Object> meter(int seq, double f, double ni) {
        return Map.of("seq", seq, "sourceTime", T0, "area", "a", "meter", "m", "frequencyHz", f, "netInterchangeMw", ni);
    }

    static Map<String, Object> published(int seq, double f, double ni, boolean sent, String why) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("topic", "loopstand/v1/s1/area/a/meter/m");
        m.put("type", "AreaMeter");
        m.put("seq", seq);
        m.put("sent", sent);
        if (why != null) {
            m.put("why", why);
        }
        m.put("message", meter(seq, f, ni));
        return m;
    }

    static Map<String, Object> command(String unit, int seq, String outcome, String reason, double before, double after,
            long issuedAt, long validUntil) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("unit", unit);
        m.put("commandSeq", seq);
        m.put("controllerId", "theirs-1");
        m.put("commandKind", "pulse");
        m.put("direction", after >= before ? "raise" : "lower");
        m.put("durationMs", 2000);
        m.put("validUntil", validUntil);
        m.put("issuedAt", issuedAt);
        m.put("epoch", 7);
        m.put("outcome", outcome);
        if (reason != null) {
            m.put("reason", reason);
            m.put("detail", "validUntil passed 300 ms ago");
        }
        m.put("loadReferenceBeforeMw", before);
        m.put("loadReferenceAfterMw", after);
        return m;
    }

    /**
     * Area a: β = 400 MW/Hz, 50 Hz, scheduled NI 100 MW until a schedule change to 120 MW at 30 s.
     * Meters every 2 s from 0 to 58 s (30 readings). Reading k (t = 2k s): f = 49.95 Hz and NI = 90 MW
     * for k < 10, then f = 50.0 and NI = 100; the reading of 40 s went through a fault stage that sent
     * f = 50.1, NI = 100 instead; the reading of 44 s was not sent (link down).
     */
    void writeRun() {
        JournalWriter plant = JournalWriter.create(run.resolve("plant.jsonl"), "plant", T0, Map.of("site", "s1", "rate", 5.0,
                "meterScanMs", 2000,
                "areas", Map.of("a", Map.of("nominalFrequencyHz", 50.0, "betaMwPerHz", 400.0, "scheduledNetInterchangeMw", 100.0)),
                "units", Map.of("u1", "a", "u2", "a")), wall, JournalWriter.DEFAULT_FLUSH_INTERVAL);
        for (int s = 0; s <= 60; s++) {
            double f = s < 20 ? 49.95 : 50.0;
            double ni = s < 20 ? 90.0 : 100.0;
            plant.append(T0 + s * 1000L, "truth", Map.of("timeS", (double) s,
                    "areas", Map.of("a", Map.of("frequencyHz", f, "loadMw", 500.0, "netInterchangeMw", ni)),
                    "ties", Map.of(), "units", Map.of()));
            if (s == 30) {
                plant.append(T0 + s * 1000L, "event", Map.of("event", "scheduleChange", "atS", 30.0, "area", "a",
                        "scheduledNetInterchangeMw", 120.0, "scheduledFrequencyHz", 50.0));
            }
            if (s % 2 == 0 && s < 60) {
                int k = s / 2;
                if (s == 40) {
                    // the fault stage's own record of what it did: the reading as built, then what went out
                    plant.append(T0 + s * 1000L, "truth", Map.of("stream", "meter:a", "record", meter(k, f, ni)));
                    plant.append(T0 + s * 1000L, "published", Map.of("stream", "meter:a", "topic",
                            "loopstand/v1/s1/area/a/meter/m", "fate", "sent", "faults", List.of("f1"), "detail", "offset",
                            "record", meter(k, 50.1, ni)));
                    plant.append(T0 + s * 1000L, "published", published(k, f, ni, true, "throughFaultStage"));
                } else {
                    plant.append(T0 + s * 1000L, "published", published(k, f, ni, s != 44, s == 44 ? "notConnected" : null));
                }
            }
        }
        // commands as the plant received them (issued 150 ms before arrival, valid 4 s from issue)
        plant.append(T0 + 5_000, "command", command("u1", 1, "accepted", null, 200, 201, T0 + 4_850, T0 + 8_850));
        plant.append(T0 + 9_000, "command", command("u2", 2, "accepted", null, 300, 299, T0 + 8_850, T0 + 12_850));
        plant.append(T0 + 47_000, "command", command("u1", 3, "rejected", "expired", 201, 201, T0 + 42_000, T0 + 46_700));
        plant.append(T0 + 47_500, "command", command("u1", 4, "accepted", null, 201, 202, T0 + 47_350, T0 + 51_350));
        // the controller's statuses as the plant received them: every 4 s, one 12 s gap at 24 → 36 s
        for (long t : new long[] {0, 4, 8, 12, 16, 20, 24, 36, 40, 44, 48, 52}) {
            Map<String, Object> st = new LinkedHashMap<>(Map.of("controllerId", "theirs-1", "seq", t, "sourceTime",
                    T0 + t * 1000, "epoch", 7, "state", t < 36 ? "regulating" : "suspended", "cycle", t / 4,
                    "areas", Map.of("a", Map.of("aceMw", -(ace(t)), "filteredAceMw", 0.0, "band", "regulating"))));
            if (t >= 36) {
                st.put("reasons", List.of("frequencyUnusable:a"));
            }
            if (t == 16 || t == 20) {
                st.put("suspendedAreas", List.of(Map.of("area", "b", "reasons", List.of("frequencyUnusable:b"),
                        "detail", "frequency:b frozen ageMs=1200", "since", T0 + 16_000)));
            }
            if (t == 40 || t == 44) {
                st.put("excludedUnits", List.of(Map.of("unit", "u2", "area", "a", "reason", "notFollowing", "shortfallMw", 3.5)));
            }
            plant.append(T0 + t * 1000 + 50, "controllerStatus", st);
        }
        plant.append(T0 + 60_000, "check", Map.of("name", "c1", "passed", true, "decidingFigure", "1", "limit", "2", "source", ""));
        plant.close(T0 + 60_000, EndReason.COMPLETED);
    }

    /** The metered ACE at the status times, with the controller's sign flipped in writeRun. */
    static double ace(long t) {
        double f = t < 20 ? 49.95 : 50.0;
        double ni = t < 20 ? 90.0 : 100.0;
        double sched = t < 30 ? 100.0 : 120.0;
        return (ni - sched) + 400 * (f - 50.0);
    }

    static Metric metric(ReportModel m, String section, String name) {
        return RunReportBuilderTest.metric(m, section, name);
    }

    @Test
    void shouldComputeTheAceFromTruthAndFromWhatTheMetersPublished() {
        writeRun();
        RunFolder folder = RunFolder.read(run);
        RunReportBuilder.AreaInfo a = new RunReportBuilder.AreaInfo("a", 50.0, 400.0, 100.0);
        List<PlantSideAce.ScheduleStep> steps = PlantSideAce.schedules(a, folder.journals().get("plant").entries(), T0);
        TimeSeries metered = PlantSideAce.fromReadings(a, PlantSideAce.meteredReadings(folder.journals().get("plant").entries())
                .get("a"), steps, "metered");
        // 30 readings, one not sent (44 s): 29 values
        assertThat(metered.size()).isEqualTo(29);
        // 0 s: (90 − 100) + 400·(49.95 − 50) = −10 − 20 = −30 MW
        assertThat(metered.valueAt(T0)).isCloseTo(-30.0, within(1e-9));
        // 20 s: (100 − 100) + 0 = 0; 30 s: schedule 120 → (100 − 120) = −20 MW
        assertThat(metered.valueAt(T0 + 20_000)).isCloseTo(0.0, within(1e-9));
        assertThat(metered.valueAt(T0 + 30_000)).isCloseTo(-20.0, within(1e-9));
        // 40 s: what the fault stage sent, f = 50.1: −20 + 400·0.1 = +20 MW (not the −20 of the reading as built)
        assertThat(metered.valueAt(T0 + 40_000)).isCloseTo(20.0, within(1e-9));
        // 44 s was not sent: the value in force there is still the 42 s one (−20 MW)
        assertThat(metered.valueAt(T0 + 45_000)).isCloseTo(-20.0, within(1e-9));
        TimeSeries truth = PlantSideAce.fromTruth(a, folder.journals().get("plant").entries().stream()
                .filter(e -> e.kind().equals("truth")).toList(), steps, "truth");
        assertThat(truth.size()).isEqualTo(61);
        assertThat(truth.valueAt(T0 + 40_000)).isCloseTo(-20.0, within(1e-9));
    }

    @Test
    void shouldReportTheCommandPathAndTheControllerAsThePlantSawThem() {
        writeRun();
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        String cp = "Command path as the plant saw it";
        assertThat(metric(m, cp, "commands received").value()).isEqualTo("4");
        assertThat(metric(m, cp, "commands accepted").value()).isEqualTo("3");
        assertThat(metric(m, cp, "pulses executed").value()).isEqualTo("3");
        assertThat(metric(m, cp, "refused: expired").value()).isEqualTo("1");
        assertThat(metric(m, cp, "refused: expired").note()).contains("u1").contains("validUntil passed");
        // margins validUntil − arrival: 3850, 3850, −300, 3850 → p50 (rank 2) 3850, min −300
        assertThat(metric(m, cp, "expiry margin at arrival p50").value()).isEqualTo("3850");
        assertThat(metric(m, cp, "expiry margin at arrival min").value()).isEqualTo("-300");
        // issue → arrival: 150, 150, 5000, 150 → p50 150, p99 (rank 4) 5000
        assertThat(metric(m, cp, "issue to arrival p50").value()).isEqualTo("150");
        assertThat(metric(m, cp, "issue to arrival p99").value()).isEqualTo("5000");
        // none is stale (the last reading sent is at most 1.5 s old: 44 s was not sent, 46 s was), but the
        // meter sent the very same values at 0, 2, 4 s and at 4, 6, 8 s: the commands of 5 s and 9 s came on
        // frozen-looking data; at 47.5 s the last three (40 s with the fault's 50.1 Hz, 42, 46 s) differ
        assertThat(metric(m, cp, "commands on stale or frozen metered data").value()).isEqualTo("2");
        // truth ACE at 5 s = −30 MW (beyond max(10, 400·0.01 = 4) = 10 MW): the raise of u1 is right;
        // at 9 s −30 MW and u2 lowered: against the ACE; at 47.5 s the truth ACE is −20 MW and u1 raised
        assertThat(metric(m, cp, "moves against the truth ACE").value()).isEqualTo("1");
        assertThat(metric(m, cp, "moves against the truth ACE").note()).startsWith("of 3 accepted moves");
        // statuses' sourceTime every 4 s but one 12 s gap: median 4 s; |12 − 4| = 8 s is the p99 deviation
        assertThat(metric(m, cp, "controller cycle period").value()).isEqualTo("4.00");
        assertThat(metric(m, cp, "controller cycle jitter p99").value()).isEqualTo("8000");
        assertThat(metric(m, cp, "longest heartbeat gap").value()).isEqualTo("12.0");
        // the controller published the ACE with the opposite sign: named as a commissioning finding
        Metric finding = metric(m, "Area a: the controller's ACE against the metered ACE", "commissioning finding");
        assertThat(finding.value()).contains("sign flip");
        // no controller journal: the controller-side counters are not shown at all, the rest is
        assertThat(m.sections()).noneMatch(s -> s.title().startsWith("Latency, controller side"));
        assertThat(m.sections().stream().flatMap(s -> s.metrics().stream()).map(Metric::name))
                .doesNotContain("acks lost plant → controller", "acks received by the controller");
        assertThat(Double.parseDouble(metric(m, "Area a: frequency quality, from the meters as published", "CPS1").value()))
                .isFinite();
    }

    @Test
    void shouldListTheControllersDecisionsWithTheirReasonsFromItsStatuses() {
        writeRun();
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        List<Metric> rows = m.sections().stream().filter(s -> s.title().startsWith("Controller decisions as the plant saw them"))
                .findFirst().orElseThrow().metrics();
        // arrival times are 50 ms after each status: rounded to whole seconds of the run
        assertThat(rows).extracting(x -> x.name() + " " + x.value() + " | " + x.note()).containsExactly(
                "0 s theirs-1 regulating | ",
                "16 s area b suspended | reasons frequencyUnusable:b; frequency:b frozen ageMs=1200",
                "24 s area b resumed | after frequencyUnusable:b",
                "36 s theirs-1 suspended | reasons frequencyUnusable:a",
                "40 s u2 excluded | reason notFollowing, shortfall 3.50 MW, area a",
                "48 s u2 re-admitted | after notFollowing");
    }

    @Test
    void shouldKeepTheVerdictToTheChecksAndNeverSayFailInAFigure() {
        writeRun();
        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        // the one scenario check passed: PASS, although figures show a sign flip and an expired command
        assertThat(m.verdict()).isEqualTo(ReportModel.Verdict.PASS);
        assertThat(m.sections().stream().flatMap(s -> s.metrics().stream()))
                .allSatisfy(x -> assertThat(x.value()).doesNotContain("FAIL"));
    }
}
