package org.loopstand.controller.following;

/**
 * A unit's expected response as the following check models it: the primary (governor) share in
 * steady state, {@code −K·(|Δf| − deadBand)} in the direction against the deviation (0 inside the
 * dead band), and how far its output lags a ramp of its load reference.
 *
 * @param mwPerHz       K = rating / (droop · f0), MW/Hz, ≥ 0 (0 = not known: no correction)
 * @param deadBandHz    governor dead band, Hz, ≥ 0
 * @param responseLagS  how far the unit's output lags a steady ramp of its load reference, s, ≥ 0
 *                      (governor servo, turbine stages and a hydro unit's transient droop
 *                      compensation; {@link #rampLagS}); 0 = not known, the dead time alone
 */
public record GovernorResponse(double mwPerHz, double deadBandHz, double responseLagS) {
    public static final GovernorResponse NONE = new GovernorResponse(0, 0);

    public GovernorResponse {
        if (!(mwPerHz >= 0) || !Double.isFinite(mwPerHz) || !(deadBandHz >= 0) || !Double.isFinite(deadBandHz)
                || !(responseLagS >= 0) || !Double.isFinite(responseLagS)) {
            throw new IllegalArgumentException("governor response needs mwPerHz >= 0, deadBandHz >= 0 and"
                    + " responseLagS >= 0, got " + mwPerHz + " MW/Hz, " + deadBandHz + " Hz, " + responseLagS + " s");
        }
    }

    /** Without a known response lag. */
    public GovernorResponse(double mwPerHz, double deadBandHz) {
        this(mwPerHz, deadBandHz, 0.0);
    }

    /**
     * How far the output lags a steady ramp of the load reference (the sum of the lags' time constants
     * less the zeros'), s. Governor servo T_g; non-reheat turbine T_t; reheat T_ch + (1 − F_hp)·T_rh; hydro
     * water column (1 − s·T_w)/(1 + s·T_w/2): 1.5·T_w, and the transient droop compensation
     * (1 + s·T_r)/(1 + s·(R_t/R_p)·T_r): (R_t/R_p − 1)·T_r.
     *
     * @param turbine "nonReheat", "reheat" or "hydro"; anything else: the servo alone
     * @return the lag, s, ≥ 0; NaN inputs count as 0
     */
    public static double rampLagS(String turbine, double governorS, double turbineS, double steamChestS,
                                  double reheatS, double hpFraction, double waterStartingS, double transientDroopPct,
                                  double droopPct, double resetS) {
        double lag = nz(governorS);
        switch (turbine == null ? "" : turbine) {
            case "nonReheat" -> lag += nz(turbineS);
            case "reheat" -> lag += nz(steamChestS) + (1 - (Double.isFinite(hpFraction) ? hpFraction : 1)) * nz(reheatS);
            case "hydro" -> {
                lag += 1.5 * nz(waterStartingS);
                if (transientDroopPct > 0 && droopPct > 0 && transientDroopPct > droopPct) {
                    lag += (transientDroopPct / droopPct - 1) * nz(resetS);
                }
            }
            default -> { }
        }
        return Math.max(0, lag);
    }

    private static double nz(double v) {
        return Double.isFinite(v) && v > 0 ? v : 0;
    }

    /** @return K = ratingMw / (droopPct/100 · f0), MW/Hz, or 0 when rating or droop is not known */
    public static double mwPerHz(double ratingMw, double droopPct, double nominalFrequencyHz) {
        if (!(ratingMw > 0) || !(droopPct > 0) || !(nominalFrequencyHz > 0)) {
            return 0.0;
        }
        return ratingMw / (droopPct / 100.0 * nominalFrequencyHz);
    }

    /** @return the steady-state governor share of the output at a deviation {@code dfHz} (f − Fs), MW */
    public double shareMw(double dfHz) {
        double beyond = Math.max(0, Math.abs(dfHz) - deadBandHz);
        return -Math.signum(dfHz) * mwPerHz * beyond;
    }

    /**
     * @return how far the governor share can have moved while the deviation stayed within
     *         [minDfHz, maxDfHz], MW (the share is monotone in the deviation)
     */
    public double spanMw(double minDfHz, double maxDfHz) {
        return Math.abs(shareMw(minDfHz) - shareMw(maxDfHz));
    }
}
