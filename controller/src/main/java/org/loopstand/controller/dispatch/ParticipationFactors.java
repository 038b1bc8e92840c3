package org.loopstand.controller.dispatch;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Participation factors for quadratic costs: {@code pf_i = (1/(2c_i)) / Σ_j (1/(2c_j))} over the
 * units not at a limit (units at a limit get 0). For quadratics, moving a base point dispatch by
 * {@code pf_i·ΔP} lands exactly on the equal-λ dispatch for {@code D + ΔP} as long as no unit
 * crosses a limit, because {@code ΔP_i = Δλ/(2c_i)} for every free unit.
 *
 * @param factors pf per unit id, each in [0, 1], summing to 1 (or all 0 if every unit is at a limit)
 */
public record ParticipationFactors(Map<String, Double> factors) {
    public ParticipationFactors {
        factors = Collections.unmodifiableMap(new LinkedHashMap<>(factors));
    }

    /** Factors over {@code units} excluding the ids in {@code atLimit}. */
    public static ParticipationFactors of(List<QuadraticCostUnit> units, Set<String> atLimit) {
        double sum = 0;
        for (QuadraticCostUnit u : units) {
            if (!atLimit.contains(u.unitId())) {
                sum += 1 / (2 * u.cDollarPerMw2h());
            }
        }
        Map<String, Double> pf = new LinkedHashMap<>();
        for (QuadraticCostUnit u : units) {
            boolean free = !atLimit.contains(u.unitId());
            pf.put(u.unitId(), free && sum > 0 ? (1 / (2 * u.cDollarPerMw2h())) / sum : 0.0);
        }
        return new ParticipationFactors(pf);
    }

    /** Factors from a dispatch solution: units it left at a limit get 0. */
    public static ParticipationFactors of(List<QuadraticCostUnit> units, DispatchResult dispatch) {
        return of(units, dispatch.atLimit());
    }

    /** @return pf of a unit, 0 if unknown */
    public double of(String unitId) {
        return factors.getOrDefault(unitId, 0.0);
    }

    /**
     * Base point plus participation move: {@code P_i = P_i,base + pf_i·ΔP}.
     *
     * @param basePointsMw base points per unit id, MW
     * @param deltaMw      change of demand, MW
     * @return new points, MW (limits not applied: check them against the units)
     */
    public Map<String, Double> move(Map<String, Double> basePointsMw, double deltaMw) {
        Map<String, Double> out = new LinkedHashMap<>();
        basePointsMw.forEach((id, p) -> out.put(id, p + of(id) * deltaMw));
        return out;
    }
}
