package org.loopstand.plant.grid;

/** How an area's controller computes its area control error; the physics does not use it. */
public enum AceConvention {
    /** {@code ACE = (NIa − NIs) − 10B(Fa − Fs)}, bias B negative in MW/0.1 Hz. */
    NORTH_AMERICAN,
    /** {@code ACE = ΔP + K·Δf}, K positive in MW/Hz. */
    EUROPEAN
}
