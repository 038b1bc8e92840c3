package org.loopstand.controller.dispatch;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Equal-incremental-cost dispatch of quadratic-cost units with limits, losses neglected.
 *
 * <p>{@code P_i(λ) = clamp((λ − b_i)/(2c_i), min_i, max_i)} is monotone in λ, so a bisection
 * (200 halvings at most) finds λ with Σ P_i(λ) = D and with it the set F of units not at a limit.
 * λ is then solved exactly over F: {@code λ = (D − Σ_fixed P + Σ_F b/(2c)) / Σ_F 1/(2c)}. When every
 * unit is at a limit, λ is the bisection's value (any λ in the gap between incremental costs).
 */
public final class EconomicDispatch {
    private static final double TOLERANCE_MW = 1e-9;

    private EconomicDispatch() {
    }

    /**
     * @param units    units to dispatch (ids unique, at least one)
     * @param demandMw total demand, MW, between Σ min and Σ max
     * @throws InfeasibleDispatchException if the demand is outside the limits' range
     */
    public static DispatchResult solve(List<QuadraticCostUnit> units, double demandMw) {
        if (units == null || units.isEmpty()) {
            throw new IllegalArgumentException("economic dispatch needs at least one unit");
        }
        if (!Double.isFinite(demandMw)) {
            throw new IllegalArgumentException("demandMw must be finite, was " + demandMw);
        }
        Set<String> ids = new HashSet<>();
        double minTotal = 0;
        double maxTotal = 0;
        for (QuadraticCostUnit u : units) {
            if (!ids.add(u.unitId())) {
                throw new IllegalArgumentException("unit id " + u.unitId() + " appears twice");
            }
            minTotal += u.minMw();
            maxTotal += u.maxMw();
        }
        double slack = 1e-9 * Math.max(1, Math.abs(maxTotal));
        if (demandMw < minTotal - slack || demandMw > maxTotal + slack) {
            throw new InfeasibleDispatchException(demandMw, minTotal, maxTotal);
        }
        double approx = bisectLambda(units, demandMw);
        double exact = exactLambda(units, demandMw, approx);
        double lambda = Double.isNaN(exact) ? approx : exact;
        Map<String, Double> out = new LinkedHashMap<>();
        Set<String> atLimit = new LinkedHashSet<>();
        double cost = 0;
        for (QuadraticCostUnit u : units) {
            double p = u.outputAtLambdaMw(lambda);
            out.put(u.unitId(), p);
            if (p <= u.minMw() + TOLERANCE_MW || p >= u.maxMw() - TOLERANCE_MW) {
                atLimit.add(u.unitId());
            }
            cost += u.costDollarPerH(p);
        }
        return new DispatchResult(demandMw, lambda, Collections.unmodifiableMap(out),
                Collections.unmodifiableSet(atLimit), cost);
    }

    /**
     * Exact λ over the units the bisection found strictly inside their limits; NaN if that set is
     * empty or the exact λ would push a unit of it outside its limits (then bisection stands).
     */
    private static double exactLambda(List<QuadraticCostUnit> units, double demandMw, double approxLambda) {
        double fixedMw = 0;
        double sumInv = 0;
        double sumBOver = 0;
        List<QuadraticCostUnit> free = new ArrayList<>();
        for (QuadraticCostUnit u : units) {
            double p = (approxLambda - u.bDollarPerMwh()) / (2 * u.cDollarPerMw2h());
            if (p > u.minMw() && p < u.maxMw()) {
                free.add(u);
                sumInv += 1 / (2 * u.cDollarPerMw2h());
                sumBOver += u.bDollarPerMwh() / (2 * u.cDollarPerMw2h());
            } else {
                fixedMw += u.outputAtLambdaMw(approxLambda);
            }
        }
        if (free.isEmpty()) {
            return Double.NaN;
        }
        double lambda = (demandMw - fixedMw + sumBOver) / sumInv;
        for (QuadraticCostUnit u : free) {
            double p = (lambda - u.bDollarPerMwh()) / (2 * u.cDollarPerMw2h());
            if (p < u.minMw() - TOLERANCE_MW || p > u.maxMw() + TOLERANCE_MW) {
                return Double.NaN;
            }
        }
        return lambda;
    }

    private static double bisectLambda(List<QuadraticCostUnit> units, double demandMw) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (QuadraticCostUnit u : units) {
            lo = Math.min(lo, u.incrementalCostDollarPerMwh(u.minMw()));
            hi = Math.max(hi, u.incrementalCostDollarPerMwh(u.maxMw()));
        }
        for (int i = 0; i < 200 && hi - lo > 1e-12; i++) {
            double mid = 0.5 * (lo + hi);
            double total = 0;
            for (QuadraticCostUnit u : units) {
                total += u.outputAtLambdaMw(mid);
            }
            if (total < demandMw) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }
}
