package org.loopstand.controller.pulsetest;

import java.util.List;
import java.util.Locale;

/**
 * Whether the unit's own output (and the area frequency, when known) stayed within stated bands over a
 * recent stretch of time. Pure.
 *
 * @param covered            the readings cover the whole stretch (enough time has passed)
 * @param outputSpreadMw     largest distance of a good reading's own output from their mean, MW (NaN if none)
 * @param outputDriftMw      mean of the stretch's second half less that of its first half, MW (NaN if
 *                           either half has no reading): a slow creep stays inside a band but is not steady
 * @param driftLimitMw       the largest drift that counts as steady, MW
 * @param frequencyOffsetHz  largest distance of a frequency reading from nominal, Hz (NaN if none)
 * @param outputBandMw       the band the output was held to, MW
 * @param frequencyBandHz    the band the frequency was held to, Hz (NaN when frequency is not checked)
 * @param forS               the stretch, s
 */
public record Steadiness(boolean covered, double outputSpreadMw, double outputDriftMw, double driftLimitMw,
        double frequencyOffsetHz, double outputBandMw, double frequencyBandHz, double forS) {

    /**
     * @param sinceMs   the stretch must not start before this, epoch ms (else it is not yet covered)
     * @param nominalHz nominal frequency, Hz, or NaN to leave frequency unchecked
     */
    public static Steadiness over(List<TelemetryPoint> telemetry, List<FrequencyPoint> frequency, long nowMs,
            long sinceMs, double forS, double outputBandMw, double driftLimitMw, double nominalHz,
            double frequencyBandHz) {
        long fromMs = nowMs - Math.round(forS * 1000);
        long midMs = nowMs - Math.round(forS * 500);
        double[] halves = new double[4];
        for (int i = telemetry.size() - 1; i >= 0 && telemetry.get(i).tMs() > fromMs; i--) {
            if (telemetry.get(i).good()) {
                int h = telemetry.get(i).tMs() > midMs ? 2 : 0;
                halves[h] += telemetry.get(i).ownMw();
                halves[h + 1]++;
            }
        }
        double drift = halves[1] > 0 && halves[3] > 0 ? halves[2] / halves[3] - halves[0] / halves[1] : Double.NaN;
        double sum = 0;
        int n = 0;
        for (int i = telemetry.size() - 1; i >= 0 && telemetry.get(i).tMs() > fromMs; i--) {
            if (telemetry.get(i).good()) {
                sum += telemetry.get(i).ownMw();
                n++;
            }
        }
        double spread = Double.NaN;
        if (n > 0) {
            double mean = sum / n;
            spread = 0;
            for (int i = telemetry.size() - 1; i >= 0 && telemetry.get(i).tMs() > fromMs; i--) {
                if (telemetry.get(i).good()) {
                    spread = Math.max(spread, Math.abs(telemetry.get(i).ownMw() - mean));
                }
            }
        }
        double offset = Double.NaN;
        if (!Double.isNaN(nominalHz)) {
            for (int i = frequency.size() - 1; i >= 0 && frequency.get(i).tMs() > fromMs; i--) {
                double d = Math.abs(frequency.get(i).frequencyHz() - nominalHz);
                offset = Double.isNaN(offset) ? d : Math.max(offset, d);
            }
        }
        return new Steadiness(fromMs >= sinceMs && n >= 2, spread, drift, driftLimitMw, offset, outputBandMw,
                Double.isNaN(nominalHz) ? Double.NaN : frequencyBandHz, forS);
    }

    /** @return the output stayed within its band and, when checked, the frequency within its band */
    public boolean steady() {
        boolean out = covered && Double.isFinite(outputSpreadMw) && outputSpreadMw <= outputBandMw
                && Double.isFinite(outputDriftMw) && Math.abs(outputDriftMw) <= driftLimitMw;
        boolean freq = Double.isNaN(frequencyBandHz) || (Double.isFinite(frequencyOffsetHz)
                && frequencyOffsetHz <= frequencyBandHz);
        return out && freq;
    }

    /** @return the figures in words, e.g. for a refusal */
    public String describe() {
        String f = Double.isNaN(frequencyBandHz) ? "frequency not checked (no droop or meter for the unit)"
                : Double.isNaN(frequencyOffsetHz) ? "no frequency reading"
                : String.format(Locale.ROOT, "frequency up to %.1f mHz from nominal (band ±%.1f mHz)",
                        frequencyOffsetHz * 1000, frequencyBandHz * 1000);
        return String.format(Locale.ROOT, "over the last %.0f s the unit's own output moved up to %.2f MW from its "
                + "mean (band ±%.2f MW) and drifted %+.2f MW between the halves (limit ±%.2f MW), %s", forS,
                outputSpreadMw, outputBandMw, outputDriftMw, driftLimitMw, f);
    }
}
