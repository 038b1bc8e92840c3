package org.loopstand.report.model;

import java.util.Objects;

/**
 * Who, where and when of a run.
 *
 * @param runId       the run folder's name, e.g. {@code 20260101T120000-step-load}
 * @param site        site id
 * @param scenario    scenario name
 * @param startedAtMs scenario time at start, epoch ms
 * @param endedAtMs   scenario time of the last journal entry, epoch ms (≥ start)
 * @param cutShort    true when a process's journal has no end entry (a process was killed)
 * @param cutShortDetail which journals were cut short and how (e.g. torn tail offsets); empty if none
 */
public record RunInfo(String runId, String site, String scenario, long startedAtMs, long endedAtMs, boolean cutShort,
        String cutShortDetail) {
    public RunInfo {
        Objects.requireNonNull(runId, "runId");
        Objects.requireNonNull(site, "site");
        Objects.requireNonNull(scenario, "scenario");
        cutShortDetail = cutShortDetail == null ? "" : cutShortDetail;
        if (endedAtMs < startedAtMs) {
            throw new IllegalArgumentException("run " + runId + " ends (" + endedAtMs + " ms) before it starts ("
                    + startedAtMs + " ms)");
        }
    }

    /** @return run duration, s */
    public double durationS() {
        return (endedAtMs - startedAtMs) / 1000.0;
    }
}
