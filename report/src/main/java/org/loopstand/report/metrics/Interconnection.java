package org.loopstand.report.metrics;

/**
 * North-American interconnections and their ε1, the targeted frequency bound used by CPS1 and BAAL
 * (NERC BAL-001-2 attachment, from memory).
 */
public enum Interconnection {
    EASTERN(0.018),
    WESTERN(0.0228),
    ERCOT(0.030),
    QUEBEC(0.0215);

    private final double epsilon1Hz;

    Interconnection(double epsilon1Hz) {
        this.epsilon1Hz = epsilon1Hz;
    }

    /** @return ε1, Hz */
    public double epsilon1Hz() {
        return epsilon1Hz;
    }
}
