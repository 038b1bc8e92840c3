package org.loopstand.controller.ace;

/**
 * Measured and scheduled quantities for one ACE evaluation.
 *
 * @param netInterchangeActualMw    NIa, sum of the area's tie flows, MW, + = export
 * @param netInterchangeScheduledMw NIs, MW, + = export
 * @param frequencyActualHz         Fa, Hz
 * @param frequencyScheduledHz      Fs, Hz (nominal, or offset during a time-error correction)
 * @param timeErrorS                accumulated time error, s, + = synchronous time ahead; 0 if unused
 * @param inadvertentAccumMwh       accumulated inadvertent interchange, MWh, + = area exported more
 *                                  than scheduled; 0 if unused
 */
public record AceInputs(double netInterchangeActualMw, double netInterchangeScheduledMw,
                        double frequencyActualHz, double frequencyScheduledHz,
                        double timeErrorS, double inadvertentAccumMwh) {
    public AceInputs {
        requireFinite("netInterchangeActualMw", netInterchangeActualMw);
        requireFinite("netInterchangeScheduledMw", netInterchangeScheduledMw);
        requireFinite("frequencyActualHz", frequencyActualHz);
        requireFinite("frequencyScheduledHz", frequencyScheduledHz);
        requireFinite("timeErrorS", timeErrorS);
        requireFinite("inadvertentAccumMwh", inadvertentAccumMwh);
    }

    /** Inputs without time-error correction or inadvertent payback. */
    public static AceInputs of(double niActualMw, double niScheduledMw, double fActualHz, double fScheduledHz) {
        return new AceInputs(niActualMw, niScheduledMw, fActualHz, fScheduledHz, 0.0, 0.0);
    }

    private static void requireFinite(String name, double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException(name + " must be finite, was " + v);
        }
    }
}
