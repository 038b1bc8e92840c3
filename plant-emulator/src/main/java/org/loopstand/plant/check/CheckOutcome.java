package org.loopstand.plant.check;

/**
 * The verdict of one check with the figure that decided it.
 *
 * @param name           the check's name in the scenario
 * @param passed         true when the check holds
 * @param decidingFigure the figure compared with the limit (NaN when there was nothing to measure; see detail)
 * @param unit           unit of the figure and the limit ("s", "mHz", "MW", "commands")
 * @param limit          the limit the figure was held against
 * @param detail         how the figure came about, for people
 * @param controllerSide true for checks on the controller's own decisions (read from what it published);
 *                       false for checks made from the plant side alone
 */
public record CheckOutcome(String name, boolean passed, double decidingFigure, String unit, double limit, String detail,
                           boolean controllerSide) {
    @Override
    public String toString() {
        return (passed ? "PASS " : "FAIL ") + name + ": " + format(decidingFigure) + " " + unit + " (limit " + format(limit)
                + " " + unit + ")" + (controllerSide ? " [controller side]" : "") + " - " + detail;
    }

    static String format(double v) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        return v == Math.rint(v) && Math.abs(v) < 1e12 ? Long.toString((long) v) : String.format(java.util.Locale.ROOT, "%.3f", v);
    }
}
