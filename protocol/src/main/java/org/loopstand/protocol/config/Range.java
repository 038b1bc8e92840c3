package org.loopstand.protocol.config;

/**
 * The values a number in a configuration file may take, printed as in the refusal: {@code [0, 100]},
 * {@code (0, 600]} (above zero), {@code [1, 10)}.
 *
 * @param min         lower bound
 * @param minIncluded whether {@code min} itself is allowed
 * @param max         upper bound
 * @param maxIncluded whether {@code max} itself is allowed
 */
public record Range(double min, boolean minIncluded, double max, boolean maxIncluded) {
    /** @return the range {@code [min, max]} */
    public static Range closed(double min, double max) {
        return new Range(min, true, max, true);
    }

    /** @return the range {@code (0, max]}: above zero, at most {@code max} */
    public static Range positive(double max) {
        return new Range(0, false, max, true);
    }

    /** @return true when {@code v} is finite and inside */
    public boolean contains(double v) {
        return Double.isFinite(v) && (minIncluded ? v >= min : v > min) && (maxIncluded ? v <= max : v < max);
    }

    @Override
    public String toString() {
        return (minIncluded ? "[" : "(") + format(min) + ", " + format(max) + (maxIncluded ? "]" : ")");
    }

    /** @return a whole number without ".0", anything else as Java prints it */
    static String format(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
