package org.loopstand.report.run;

import static org.assertj.core.api.Assertions.assertThat;

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
import org.loopstand.report.model.ReportModel;

/** The controller's re-dispatches, read from its journal's notes into a table and a chart. */
class DispatchFiguresTest {
    static final long T0 = 1_767_225_600_000L;

    @TempDir
    Path run;

    @Test
    void shouldListEachRedispatchWithLambdaDemandAndBasePointsAndChartThem() {
        VirtualClock wall = new VirtualClock(T0);
        JournalWriter plant = JournalWriter.create(run.resolve("plant.jsonl"), "plant", T0, Map.of("site", "s1"), wall,
                JournalWriter.DEFAULT_FLUSH_INTERVAL);
        JournalWriter ctl = JournalWriter.create(run.resolve("controller.jsonl"), "controller", T0, Map.of(), wall,
                JournalWriter.DEFAULT_FLUSH_INTERVAL);
        // the figures of Wood & Wollenberg Example 3A (from memory) as the controller would note them at 850 MW
        ctl.append(T0 + 60_000, "decided", Map.of("cycle", 15, "state", "regulating", "reasons", List.of(), "areas", List.of(),
                "notes", List.of("redispatch:a:lambda=9.1483:demandMw=850.0:basePointsMw={u1=393.2, u2=334.6, u3=122.2}")));
        ctl.append(T0 + 120_000, "decided", Map.of("cycle", 30, "state", "regulating", "reasons", List.of(), "areas", List.of(),
                "notes", List.of("redispatchInfeasible:a:demandMw=1300.0:rangeMw=300.0..1200.0", "other:note")));
        ctl.close(T0 + 121_000, EndReason.COMPLETED);
        plant.close(T0 + 121_000, EndReason.COMPLETED);

        ReportModel m = RunReportBuilder.build(RunFolder.read(run), Map.of(), List.of(), "test");
        List<Metric> rows = m.sections().stream().filter(s -> s.title().startsWith("Tertiary re-dispatch")).findFirst()
                .orElseThrow().metrics();
        assertThat(rows).extracting(r -> r.name() + " | " + r.value() + " | " + r.note()).containsExactly(
                "60 s a | λ 9.1483 $/MWh | demand 850.0 MW; base points u1=393.2, u2=334.6, u3=122.2 MW",
                "120 s a | infeasible | demand 1300.0 MW outside the eligible units' range 300.0 .. 1200.0 MW");
        Chart c = m.charts().stream().filter(x -> x.title().startsWith("Tertiary re-dispatch")).findFirst().orElseThrow();
        assertThat(c.series()).extracting(s -> s.name() + "=" + s.value(0)).containsExactly("u1 base point (MW)=393.2",
                "u2 base point (MW)=334.6", "u3 base point (MW)=122.2", "λ a ($/MWh)=9.1483");
    }
}
