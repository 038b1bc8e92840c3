package org.loopstand.report.model;

import java.util.Locale;
import java.util.OptionalDouble;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * How close a check's deciding figure came to its limit. Real-time runs of one scenario differ a little from
 * run to run (the controller's cycles fall at other instants against the meter scans and the faults), so a
 * figure close to its limit can fall on either side of it next time: the verdict and the report say so.
 */
public final class CheckMargin {
    /** Within this share of the limit a figure counts as near it (common practice, no source). */
    public static final double NEAR_SHARE = 0.10;
    private static final Pattern QUANTITY = Pattern.compile("^[≤≥<>= ]*(-?\\d+(?:\\.\\d+)?)\\s*(\\S*)");

    private CheckMargin() {
    }

    /**
     * @return |limit − figure| / limit when both are numbers of the same unit and the limit is above 0, else empty
     *         (a figure of n/a, a count held to 0)
     */
    public static OptionalDouble shareOfLimit(CheckResult c) {
        Matcher f = QUANTITY.matcher(c.decidingFigure().strip());
        Matcher l = QUANTITY.matcher(c.limit().strip());
        if (!f.find() || !l.find() || !f.group(2).equals(l.group(2))) {
            return OptionalDouble.empty();
        }
        double limit = Double.parseDouble(l.group(1));
        double figure = Double.parseDouble(f.group(1));
        return limit > 0 ? OptionalDouble.of(Math.abs(limit - figure) / limit) : OptionalDouble.empty();
    }

    /** @return true when the figure lies within {@link #NEAR_SHARE} of the limit, on either side */
    public static boolean near(CheckResult c) {
        OptionalDouble share = shareOfLimit(c);
        return share.isPresent() && share.getAsDouble() <= NEAR_SHARE;
    }

    /** @return one sentence for a check {@link #near} its limit */
    public static String describe(CheckResult c) {
        return String.format(Locale.ROOT, "%s %s: %s against its limit %s, within %.0f %% of it; real-time rehearsals of"
                        + " one scenario differ a little from run to run and from lockstep, so another run can fall on"
                        + " the other side", c.passed() ? "passed" : "failed",
                c.name(), c.decidingFigure(), c.limit(), NEAR_SHARE * 100);
    }
}
