package org.loopstand.report.model;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Everything one run's report shows. The rehearsal fills it from the run's journals; the HTML writer
 * only lays it out.
 *
 * @param run           run metadata
 * @param checks        the scenario checks, in scenario order
 * @param sections      metric tables (frequency quality, communication)
 * @param charts        charts on the shared time axis, top to bottom
 * @param histograms    histograms (latencies, jitter)
 * @param configuration the run's configuration as key → value (site file, scenario, options)
 * @param versions      software versions as name → version (Loopstand, Java, libraries)
 * @param notes         free remarks shown under the checks (e.g. journal damage found)
 */
public record ReportModel(RunInfo run, List<CheckResult> checks, List<MetricSection> sections, List<Chart> charts,
        List<Histogram> histograms, Map<String, String> configuration, Map<String, String> versions,
        List<String> notes) {

    /** The overall result shown in the header badge. */
    public enum Verdict {
        PASS("PASS"),
        FAIL("FAIL"),
        CUT_SHORT("CUT SHORT"),
        NO_CHECKS("NO CHECKS");

        private final String label;

        Verdict(String label) {
            this.label = label;
        }

        /** @return the badge text */
        public String label() {
            return label;
        }
    }

    public ReportModel {
        Objects.requireNonNull(run, "run");
        checks = List.copyOf(checks);
        sections = List.copyOf(sections);
        charts = List.copyOf(charts);
        histograms = List.copyOf(histograms);
        // Insertion order is kept: the rehearsal lists configuration in a meaningful order.
        configuration = Collections.unmodifiableMap(new LinkedHashMap<>(configuration));
        versions = Collections.unmodifiableMap(new LinkedHashMap<>(versions));
        notes = List.copyOf(notes);
    }

    /**
     * A run cut short is never a pass, whatever its checks say: its checks judged a partial record.
     *
     * @return the overall verdict
     */
    public Verdict verdict() {
        if (run.cutShort()) {
            return Verdict.CUT_SHORT;
        }
        if (checks.isEmpty()) {
            return Verdict.NO_CHECKS;
        }
        return checks.stream().allMatch(CheckResult::passed) ? Verdict.PASS : Verdict.FAIL;
    }
}
