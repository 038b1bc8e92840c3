package org.loopstand.controller.config;

/**
 * What the controller needs of one unit from the site file. Live limits, ramp and pulse rate come
 * from the unit's telemetry; these figures are used for economic dispatch and for the governor
 * share in the following check.
 *
 * @param id          unit id
 * @param area        area it regulates for
 * @param costA       cost curve constant, $/h
 * @param costB       linear cost coefficient, $/MWh
 * @param costC       quadratic cost coefficient, $/(MW²h); 0 = no usable cost curve
 * @param minMw       lowest regulating output, MW (regulatingMinMw, else minOutputMw, else 0)
 * @param maxMw       highest regulating output, MW (regulatingMaxMw, else maxOutputMw, else ratingMw)
 * @param ratingMw    rating, MW (NaN when not given)
 * @param droopPct    permanent droop, % (NaN when not given)
 */
public record SiteUnit(String id, String area, double costA, double costB, double costC, double minMw,
                       double maxMw, double ratingMw, double droopPct) {
    /** @return the expected governor response rating/(droop·f0), MW/Hz, or 0 when not known */
    public double primaryResponseMwPerHz(double nominalFrequencyHz) {
        if (!(ratingMw > 0) || !(droopPct > 0)) {
            return 0.0;
        }
        return ratingMw / (droopPct / 100.0) / nominalFrequencyHz;
    }
}
