package org.loopstand.plant.fault;

import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.Optional;

/**
 * One parameter of a fault type or a check: its name (with the unit in it), unit, range and default.
 * Either a number in [min, max] or a text from {@code choices} (an empty choice list accepts any id).
 *
 * @param name         parameter name, e.g. {@code delayMs}
 * @param unit         unit as shown to people ("ms", "MW", "" for none)
 * @param text         true for a text parameter, false for a number
 * @param min          smallest number accepted (numbers only)
 * @param max          largest number accepted (numbers only)
 * @param defaultValue value when absent (Double or String); null = the parameter is required
 * @param choices      accepted texts (text only); empty = any text
 * @param description  one line for docs and {@code fault list}
 */
public record ParameterSpec(String name, String unit, boolean text, double min, double max, Object defaultValue,
                            List<String> choices, String description) {
    public ParameterSpec {
        Objects.requireNonNull(name, "name");
        choices = List.copyOf(choices);
    }

    public static ParameterSpec number(String name, String unit, double min, double max, Double defaultValue,
            String description) {
        return new ParameterSpec(name, unit, false, min, max, defaultValue, List.of(), description);
    }

    public static ParameterSpec choice(String name, String defaultValue, List<String> choices, String description) {
        return new ParameterSpec(name, "", true, Double.NaN, Double.NaN, defaultValue, choices, description);
    }

    public boolean required() {
        return defaultValue == null;
    }

    /** @return why {@code value} is not acceptable, if it is not */
    public Optional<String> check(Object value) {
        if (text) {
            if (!(value instanceof String s)) {
                return Optional.of(name + " must be a text" + choicesText() + ", got " + value
                        + (value instanceof Number ? " (a number)" : ""));
            }
            if (!choices.isEmpty() && !choices.contains(s)) {
                return Optional.of(name + " must be one of " + choices + ", got '" + s + "'");
            }
            return Optional.empty();
        }
        if (!(value instanceof Number n) || !Double.isFinite(n.doubleValue())) {
            // quoted text ("350") reads like the number it holds unless the message shows its quotes
            return Optional.of(name + " must be a finite number (" + unitText() + "), got " + (value instanceof String
                    ? "the text \"" + value + "\" (write numbers without quotes)" : value));
        }
        double v = n.doubleValue();
        if (v < min || v > max) {
            return Optional.of(name + " must lie in " + rangeText() + ", got " + format(v));
        }
        return Optional.empty();
    }

    /** @return e.g. {@code [0, 60000] ms} */
    public String rangeText() {
        return text ? (choices.isEmpty() ? "any id" : String.join(" | ", choices))
                : "[" + format(min) + ", " + format(max) + "]" + (unit.isEmpty() ? "" : " " + unit);
    }

    public String defaultText() {
        if (defaultValue == null) {
            return "required";
        }
        if (defaultValue instanceof Double d) {
            return d.isNaN() ? "not set" : format(d);
        }
        return defaultValue.toString().isEmpty() ? "not set" : defaultValue.toString();
    }

    private String unitText() {
        return unit.isEmpty() ? "no unit" : unit;
    }

    private String choicesText() {
        return choices.isEmpty() ? "" : " (" + String.join(", ", choices) + ")";
    }

    static String format(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return String.format(Locale.ROOT, "%s", v);
    }
}
