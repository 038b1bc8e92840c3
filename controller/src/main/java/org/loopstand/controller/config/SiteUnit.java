package org.loopstand.controller.config;

import org.loopstand.controller.following.GovernorResponse;

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
 * @param deadBandHz  governor dead band, Hz (0 when not given)
 * @param responseLagS how far the unit's output lags a ramp of its load reference, s, from its
 *                    turbine data ({@link GovernorResponse#rampLagS}); 0 when not given
 */
public record SiteUnit(String id, String area, double costA, double costB, double costC, double minMw,
                       double maxMw, double ratingMw, double droopPct, double deadBandHz, double responseLagS) {
    /** Without a known response lag. */
    public SiteUnit(String id, String area, double costA, double costB, double costC, double minMw, double maxMw,
                    double ratingMw, double droopPct, double deadBandHz) {
        this(id, area, costA, costB, costC, minMw, maxMw, ratingMw, droopPct, deadBandHz, 0.0);
    }

    /** Without a governor dead band. */
    public SiteUnit(String id, String area, double costA, double costB, double costC, double minMw, double maxMw,
                    double ratingMw, double droopPct) {
        this(id, area, costA, costB, costC, minMw, maxMw, ratingMw, droopPct, 0.0);
    }

    /** @return the expected governor response rating/(droop·f0), MW/Hz, or 0 when not known */
    public double primaryResponseMwPerHz(double nominalFrequencyHz) {
        return GovernorResponse.mwPerHz(ratingMw, droopPct, nominalFrequencyHz);
    }

    /** @return the unit's governor as the following check models it (none when rating or droop is missing) */
    public GovernorResponse governor(double nominalFrequencyHz) {
        double k = primaryResponseMwPerHz(nominalFrequencyHz);
        double lag = responseLagS >= 0 && Double.isFinite(responseLagS) ? responseLagS : 0.0;
        return k > 0 ? new GovernorResponse(k, deadBandHz >= 0 && Double.isFinite(deadBandHz) ? deadBandHz : 0.0, lag)
                : new GovernorResponse(0, 0, lag);
    }
}
