package org.loopstand.controller.dispatch;

/**
 * A unit with cost {@code C(P) = a + b·P + c·P²} $/h on {@code [minMw, maxMw]}.
 * Incremental cost {@code dC/dP = b + 2cP} $/MWh.
 *
 * @param unitId              unit id
 * @param aDollarPerH         fixed cost, $/h
 * @param bDollarPerMwh       linear coefficient, $/MWh
 * @param cDollarPerMw2h      quadratic coefficient, $/(MW²·h), &gt; 0
 * @param minMw               lower limit, MW
 * @param maxMw               upper limit, MW, ≥ minMw
 */
public record QuadraticCostUnit(String unitId, double aDollarPerH, double bDollarPerMwh, double cDollarPerMw2h,
                                double minMw, double maxMw) {
    public QuadraticCostUnit {
        if (unitId == null || unitId.isBlank()) {
            throw new IllegalArgumentException("unitId must not be blank");
        }
        if (!Double.isFinite(aDollarPerH) || !Double.isFinite(bDollarPerMwh)) {
            throw new IllegalArgumentException("unit " + unitId + ": cost coefficients a and b must be finite");
        }
        if (!(cDollarPerMw2h > 0) || !Double.isFinite(cDollarPerMw2h)) {
            throw new IllegalArgumentException("unit " + unitId + ": quadratic coefficient c must be > 0 $/(MW²h), was "
                    + cDollarPerMw2h);
        }
        if (!Double.isFinite(minMw) || !Double.isFinite(maxMw) || minMw > maxMw) {
            throw new IllegalArgumentException("unit " + unitId + ": need minMw <= maxMw, was " + minMw + ".." + maxMw);
        }
    }

    /**
     * From a heat-rate curve {@code H(P) = h0 + h1·P + h2·P²} MBtu/h and a fuel price $/MBtu:
     * cost = fuel × heat rate.
     */
    public static QuadraticCostUnit fromHeatRate(String unitId, double h0MBtuPerH, double h1MBtuPerMwh,
                                                 double h2MBtuPerMw2h, double fuelDollarPerMBtu,
                                                 double minMw, double maxMw) {
        if (!(fuelDollarPerMBtu > 0)) {
            throw new IllegalArgumentException("unit " + unitId + ": fuel price must be > 0 $/MBtu, was " + fuelDollarPerMBtu);
        }
        return new QuadraticCostUnit(unitId, h0MBtuPerH * fuelDollarPerMBtu, h1MBtuPerMwh * fuelDollarPerMBtu,
                h2MBtuPerMw2h * fuelDollarPerMBtu, minMw, maxMw);
    }

    /** @return cost at {@code pMw}, $/h */
    public double costDollarPerH(double pMw) {
        return aDollarPerH + bDollarPerMwh * pMw + cDollarPerMw2h * pMw * pMw;
    }

    /** @return incremental cost at {@code pMw}, $/MWh */
    public double incrementalCostDollarPerMwh(double pMw) {
        return bDollarPerMwh + 2 * cDollarPerMw2h * pMw;
    }

    /** @return output where the incremental cost equals λ, clamped to the limits, MW */
    public double outputAtLambdaMw(double lambdaDollarPerMwh) {
        double p = (lambdaDollarPerMwh - bDollarPerMwh) / (2 * cDollarPerMw2h);
        return Math.max(minMw, Math.min(maxMw, p));
    }
}
