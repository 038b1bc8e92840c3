package org.loopstand.controller.ace;

/**
 * One ACE value and its parts, all MW. {@code aceMw = interchangeTermMw + frequencyTermMw +
 * timeErrorTermMw + paybackTermMw}. Positive ACE = over-generation (area should lower).
 *
 * @param aceMw              area control error, MW
 * @param interchangeTermMw  ΔNI = NIa − NIs (0 in flat-frequency mode), MW
 * @param frequencyTermMw    β·(Fa − Fs) with β = −10B = K (0 in flat-tie-line mode), MW
 * @param timeErrorTermMw    time-error correction term, MW
 * @param paybackTermMw      inadvertent interchange payback term, MW
 */
public record AceResult(double aceMw, double interchangeTermMw, double frequencyTermMw,
                        double timeErrorTermMw, double paybackTermMw) {
}
