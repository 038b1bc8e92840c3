package org.loopstand.report.model;

import java.util.List;
import java.util.Objects;

/**
 * A titled table of metrics.
 *
 * @param title   section title, e.g. {@code Area north: frequency quality}
 * @param group   which part of the report it belongs to
 * @param metrics the rows
 */
public record MetricSection(String title, Group group, List<Metric> metrics) {
    /** The report part a section is shown in. */
    public enum Group {
        FREQUENCY_QUALITY,
        COMMUNICATION,
        /** A unit's measured response (pulse test), one section per step. */
        UNIT_RESPONSE
    }

    public MetricSection {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(group, "group");
        metrics = List.copyOf(metrics);
    }
}
