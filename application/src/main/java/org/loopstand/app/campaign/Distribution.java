package org.loopstand.app.campaign;

import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * What a campaign draws one value from: a number uniform in [min, max], one of a list of numbers, or
 * one of a list of texts (each equally likely).
 */
public sealed interface Distribution permits Distribution.Uniform, Distribution.OneOf {
    /** @return the drawn value: a Double for numbers, a String for texts */
    Object draw(SplittableRandom random);

    /** @return the distribution as written in a campaign file, e.g. {@code 60..300} or {@code [a, b]} */
    String describe();

    /** @return the smallest and largest number it can give; NaN for texts */
    double min();

    double max();

    /** Uniform over [minValue, maxValue]; equal ends give that one number. */
    record Uniform(double min, double max) implements Distribution {
        @Override
        public Object draw(SplittableRandom random) {
            // rounded to the millisecond / milli-unit: the scenario file written for the run gives the same number back
            double v = min == max ? min : min + random.nextDouble() * (max - min);
            return Math.round(v * 1000.0) / 1000.0;
        }

        @Override
        public String describe() {
            return min == max ? format(min) : format(min) + ".." + format(max);
        }
    }

    /** One of the listed values, each equally likely: all numbers (Double) or all texts (String). */
    record OneOf(List<?> values) implements Distribution {
        public OneOf {
            values = List.copyOf(values);
        }

        @Override
        public Object draw(SplittableRandom random) {
            return values.get(random.nextInt(values.size()));
        }

        @Override
        public String describe() {
            return values.stream().map(v -> v instanceof Double d ? format(d) : String.valueOf(v)).toList().toString();
        }

        /** @return true when the values are texts */
        public boolean texts() {
            return !values.isEmpty() && values.get(0) instanceof String;
        }

        /** @return the values as texts (empty when they are numbers) */
        public List<String> textValues() {
            return texts() ? values.stream().map(String::valueOf).toList() : List.of();
        }

        @Override
        public double min() {
            return values.stream().filter(Double.class::isInstance).mapToDouble(v -> (Double) v).min().orElse(Double.NaN);
        }

        @Override
        public double max() {
            return values.stream().filter(Double.class::isInstance).mapToDouble(v -> (Double) v).max().orElse(Double.NaN);
        }
    }

    static String format(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : String.format(Locale.ROOT, "%s", v);
    }
}
