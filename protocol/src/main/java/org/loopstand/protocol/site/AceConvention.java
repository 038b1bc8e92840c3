package org.loopstand.protocol.site;

/**
 * How an area states its frequency bias and computes its area control error; both give the same ACE
 * when {@code B = −K/10}. The physics does not use it; the controller does.
 */
public enum AceConvention {
    /** {@code ACE = (NIa − NIs) − 10B(Fa − Fs)}, bias B negative in MW/0.1 Hz; written {@code northAmerican}. */
    NORTH_AMERICAN,
    /** {@code ACE = ΔP + K·Δf}, K positive in MW/Hz, ΔP = NIa − NIs; written {@code european}. */
    EUROPEAN
}
