package org.loopstand.report.model;

import java.util.List;
import java.util.Objects;

/**
 * A chart on the report's shared time axis.
 *
 * @param title   chart title, e.g. {@code Frequency}
 * @param yLabel  y axis label with unit, e.g. {@code Hz}
 * @param series  the lines drawn, at least one
 * @param stepped true to draw as steps (pulses, quality codes, fault on/off)
 */
public record Chart(String title, String yLabel, List<TimeSeries> series, boolean stepped) {
    public Chart {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(yLabel, "yLabel");
        series = List.copyOf(series);
        if (series.isEmpty()) {
            throw new IllegalArgumentException("chart '" + title + "' has no series");
        }
    }
}
