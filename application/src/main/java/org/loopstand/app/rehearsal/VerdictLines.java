package org.loopstand.app.rehearsal;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.report.model.CheckMargin;
import org.loopstand.report.model.CheckResult;
import org.loopstand.report.model.ReportModel;

/**
 * The verdict as the terminal shows it at the end of a rehearsal: the same verdict as the report's badge
 * (both come from {@link ReportModel#verdict()}), and each failing check with its deciding figure, or, where it has
 * none, the detail that decided it.
 */
public final class VerdictLines {
    private VerdictLines() {
    }

    public static List<String> of(ReportModel model) {
        List<String> out = new ArrayList<>();
        List<CheckResult> checks = model.checks();
        long failed = checks.stream().filter(c -> !c.passed()).count();
        String label = model.verdict().label();
        String detail = switch (model.verdict()) {
            case PASS -> checks.size() + " of " + checks.size() + " checks passed";
            case FAIL -> failed + " of " + checks.size() + " checks failed";
            case CUT_SHORT -> "the run was cut short, so its checks judged a partial record"
                    + (model.run().cutShortDetail().isEmpty() ? "" : " (" + model.run().cutShortDetail() + ")");
            case NO_CHECKS -> "the scenario decided no check (it names none, or the run stopped before its end)";
        };
        out.add("verdict: " + label + " (" + detail + ")");
        for (CheckResult c : checks) {
            if (!c.passed()) {
                // a check that never got a figure (never back, nothing to judge) is decided by its detail: say it
                boolean noFigure = c.decidingFigure().startsWith("n/a") && !c.source().isEmpty();
                out.add("  FAIL " + c.name() + ": " + c.decidingFigure() + " (limit " + c.limit() + ")"
                        + (noFigure ? " - " + c.source() : ""));
            }
        }
        for (CheckResult c : checks) {
            if (CheckMargin.near(c)) {
                out.add("  near its limit: " + CheckMargin.describe(c));
            }
        }
        return out;
    }
}
