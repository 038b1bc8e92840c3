package org.loopstand.plant.grid;

/**
 * Production cost {@code costA + costB·P + costC·P²} in $/h with P in MW, for economic dispatch.
 *
 * @param costA $/h
 * @param costB $/MWh
 * @param costC $/MW²h, ≥ 0
 */
public record CostCurve(double costA, double costB, double costC) {
    /** @return cost at {@code outputMw}, $/h */
    public double costPerHour(double outputMw) {
        return costA + costB * outputMw + costC * outputMw * outputMw;
    }

    /** @return incremental cost dC/dP at {@code outputMw}, $/MWh */
    public double incrementalCostPerMwh(double outputMw) {
        return costB + 2.0 * costC * outputMw;
    }
}
