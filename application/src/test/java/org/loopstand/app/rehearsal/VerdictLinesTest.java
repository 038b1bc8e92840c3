package org.loopstand.app.rehearsal;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.model.RunInfo;

class VerdictLinesTest {
    @Test
    void shouldSayWhyAFailingCheckWithoutAFigureFailed() {
        RunInfo run = new RunInfo("r", "tarnwick", "tarnwick-step-trip.yaml", 0, 600_000, false, "");
        String never = "frequency of quarry-heights within ±20 mHz of 50 Hz: not back by the end (600 s), deviation then"
                + " 947.058 mHz, worst 947.058 mHz";
        ReportModel model = new ReportModel(run, List.of(new CheckResult("quarry-freq-back", false, "n/a", "170 s", never),
                new CheckResult("quarry-ace", false, "179 s", "170 s", "truth ACE of quarry-heights back at 239 s")),
                List.of(), List.of(), List.of(), Map.of(), Map.of(), List.of());

        assertThat(VerdictLines.of(model)).containsExactly("verdict: FAIL (2 of 2 checks failed)",
                "  FAIL quarry-freq-back: n/a (limit 170 s) - " + never,
                "  FAIL quarry-ace: 179 s (limit 170 s)");
    }
}
