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
                "  FAIL quarry-ace: 179 s (limit 170 s)",
                // 9 s over 170 s is 5.3 %, within the 10 % that counts as near (common practice, no source)
                "  near its limit: failed quarry-ace: 179 s against its limit 170 s, within 10 % of it; real-time"
                        + " rehearsals of one scenario differ a little from run to run and from lockstep, so another"
                        + " run can fall on the other side");
    }

    @Test
    void shouldNotFlagAPassFarFromItsLimit() {
        RunInfo run = new RunInfo("r", "demo-site", "rehearse-unit-trip.yaml", 0, 1_200_000, false, "");
        ReportModel model = new ReportModel(run, List.of(new CheckResult("tie-back", true, "406 s", "900 s", "")),
                List.of(), List.of(), List.of(), Map.of(), Map.of(), List.of());
        assertThat(VerdictLines.of(model)).containsExactly("verdict: PASS (1 of 1 checks passed)");
    }
}
