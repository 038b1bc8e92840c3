package org.loopstand.report.model;

import java.util.Locale;
import java.util.Objects;

/**
 * One figure in a metrics table, already formatted.
 *
 * @param name   what it is, e.g. {@code CPS1}
 * @param value  formatted value, e.g. {@code 148.6}; {@code –} when not available
 * @param unit   unit, e.g. {@code %}; may be empty
 * @param note   how it was computed or its source; may be empty
 */
public record Metric(String name, String value, String unit, String note) {
    public Metric {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(value, "value");
        unit = unit == null ? "" : unit;
        note = note == null ? "" : note;
    }

    /**
     * @param decimals digits after the point, 0–9
     * @return a metric with the value formatted, or {@code –} when NaN
     */
    public static Metric of(String name, double value, int decimals, String unit, String note) {
        String text = Double.isNaN(value) ? "–"
                : Double.isInfinite(value) ? (value > 0 ? "∞" : "−∞")
                : String.format(Locale.ROOT, "%." + decimals + "f", value);
        return new Metric(name, text, unit, note);
    }
}
