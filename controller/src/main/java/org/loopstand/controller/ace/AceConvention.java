package org.loopstand.controller.ace;

/** How an area states its frequency bias. Both give the same ACE when {@code B = −K/10}. */
public enum AceConvention {
    /** {@code ACE = (NIa − NIs) − 10B(Fa − Fs)}, B negative in MW/0.1 Hz. */
    NORTH_AMERICAN,
    /** {@code ACE = ΔP + K·Δf}, K positive in MW/Hz, ΔP = NIa − NIs. */
    EUROPEAN
}
