package org.loopstand.controller.dispatch;

import java.util.Map;
import java.util.Set;

/**
 * Economic dispatch solution.
 *
 * @param demandMw            demand served, MW
 * @param lambdaDollarPerMwh  system incremental cost λ, $/MWh (for the units not at a limit;
 *                            if all are at a limit, the incremental cost of the marginal unit)
 * @param outputMw            output per unit id, MW (iteration order = input order)
 * @param atLimit             ids of units at their min or max limit
 * @param totalCostDollarPerH total cost, $/h
 */
public record DispatchResult(double demandMw, double lambdaDollarPerMwh, Map<String, Double> outputMw,
                             Set<String> atLimit, double totalCostDollarPerH) {
    public double outputMw(String unitId) {
        Double p = outputMw.get(unitId);
        if (p == null) {
            throw new IllegalArgumentException("no unit " + unitId + " in this dispatch");
        }
        return p;
    }
}
