package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.loopstand.controller.cycle.AreaInterlockState;
import org.loopstand.controller.cycle.CycleOutcome;
import org.loopstand.controller.intake.IntakeRouter;
import org.loopstand.controller.intake.SourceValidator;
import org.loopstand.controller.intake.ValidatedInput;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.SuspendedArea;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Journals each area's suspension and resumption with its reason codes and figures, and gives the
 * list the status shows. Events: {@code areaSuspended} (area, reasons, detail, and per unusable
 * input its latest reading, age and identical readings in a row) on the cycle an area falls from
 * regulating; {@code areaResumed} (area, after which reasons, suspended for how long) on the cycle
 * it regulates again. The start-up wait ({@code notStarted}) is no suspension. Agent thread only.
 */
final class AreaSuspensionJournal {
    private static final Logger LOG = LoggerFactory.getLogger(AreaSuspensionJournal.class);
    private static final int MAX_TEXT = 256;

    private final IntakeRouter intake;
    private final JournalWriter journal;
    /** areas suspended by a fall from regulating, with that suspension's reasons */
    private final Map<String, List<String>> fallen = new HashMap<>();
    private long suspensions;

    AreaSuspensionJournal(IntakeRouter intake, JournalWriter journal) {
        this.intake = intake;
        this.journal = journal;
    }

    /** Journals this cycle's area suspensions and resumptions. */
    void update(CycleOutcome o) {
        for (AreaInterlockState a : o.areaStates()) {
            if (a.suspendedNow()) {
                suspensions++;
                fallen.put(a.areaId(), a.reasons());
                Map<String, Object> f = new LinkedHashMap<>();
                f.put("event", "areaSuspended");
                f.put("area", a.areaId());
                f.put("reasons", a.reasons());
                f.put("detail", a.detail());
                f.put("inputs", inputFigures(a.reasons(), o.nowMs()));
                LOG.info("area {} suspended: {} ({})", a.areaId(), a.reasons(), a.detail());
                append(o.nowMs(), f);
            } else if (a.resumedNow() && fallen.containsKey(a.areaId())) {
                Map<String, Object> f = new LinkedHashMap<>();
                f.put("event", "areaResumed");
                f.put("area", a.areaId());
                f.put("after", fallen.remove(a.areaId()));
                LOG.info("area {} resumed", a.areaId());
                append(o.nowMs(), f);
            }
        }
    }

    /** @return the suspended areas as the status lists them */
    static List<SuspendedArea> forStatus(CycleOutcome o) {
        List<SuspendedArea> out = new ArrayList<>();
        for (AreaInterlockState a : o.suspendedAreas()) {
            List<String> reasons = a.reasons().isEmpty() ? List.of("suspended") : a.reasons().stream()
                    .map(AreaSuspensionJournal::clip).toList();
            String detail = a.detail().isEmpty() ? String.join(",", reasons) : a.detail();
            out.add(new SuspendedArea(a.areaId(), reasons, clip(detail), Math.max(1, a.suspendedSinceMs())));
        }
        return out;
    }

    /** @return falls of an area from regulating so far */
    long suspensions() {
        return suspensions;
    }

    /** Latest reading, its age and the identical readings in a row of every input a reason names. */
    private List<Map<String, Object>> inputFigures(List<String> reasons, long nowMs) {
        List<Map<String, Object>> out = new ArrayList<>();
        for (String r : reasons) {
            String[] p = r.split(":");
            ValidatedInput in = null;
            if (p[0].equals("frequencyUnusable") && p.length == 2) {
                in = intake.frequencyInput(p[1]);
            } else if (p[0].equals("tieFlowUnusable") && p.length == 3) {
                in = intake.tieFlowInput(p[1], p[2]);
            }
            if (in == null) {
                continue;
            }
            SourceValidator v = in.primary();
            Map<String, Object> f = new LinkedHashMap<>();
            f.put("input", r);
            if (v.latest() != null) {
                double value = v.latest().value();
                f.put("latestValue", Double.isFinite(value) ? (Object) value : "notFinite");
                f.put("ageMs", nowMs - v.latest().sourceTimeMs());
                f.put("identicalReadings", v.identicalRun());
            } else {
                f.put("latestValue", "none");
            }
            out.add(f);
        }
        return out;
    }

    private void append(long nowMs, Map<String, Object> f) {
        if (journal != null) {
            journal.append(nowMs, JournalFormat.KIND_EVENT, f);
        }
    }

    private static String clip(String s) {
        return s.length() <= MAX_TEXT ? s : s.substring(0, MAX_TEXT - 1) + "…";
    }
}
