package org.loopstand.controller.following;

/**
 * A unit's expected primary (governor) response in steady state: {@code −K·(|Δf| − deadBand)} in the
 * direction against the deviation, 0 inside the dead band.
 *
 * @param mwPerHz    K = rating / (droop · f0), MW/Hz, ≥ 0 (0 = not known: no correction)
 * @param deadBandHz governor dead band, Hz, ≥ 0
 */
public record GovernorResponse(double mwPerHz, double deadBandHz) {
    public static final GovernorResponse NONE = new GovernorResponse(0, 0);

    public GovernorResponse {
        if (!(mwPerHz >= 0) || !Double.isFinite(mwPerHz) || !(deadBandHz >= 0) || !Double.isFinite(deadBandHz)) {
            throw new IllegalArgumentException("governor response needs mwPerHz >= 0 and deadBandHz >= 0, got "
                    + mwPerHz + " MW/Hz, " + deadBandHz + " Hz");
        }
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
