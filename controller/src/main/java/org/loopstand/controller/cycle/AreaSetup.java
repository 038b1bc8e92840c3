package org.loopstand.controller.cycle;

import java.util.List;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.dispatch.QuadraticCostUnit;
import org.loopstand.controller.regulation.RegulationSettings;

/**
 * Configuration of one area in the cycle.
 *
 * @param ace                 ACE settings
 * @param regulation          filter, PI and bands; its cycleS must equal the cycle's
 * @param costs               cost curves of the area's units (may be empty: then shares are equal)
 * @param redispatchPeriodMs  tertiary re-dispatch period, ms; 0 = off (needs costs when &gt; 0)
 * @param redispatchRampShare share of ramp used for base point moves, (0, 1]
 */
public record AreaSetup(AreaControlSettings ace, RegulationSettings regulation, List<QuadraticCostUnit> costs,
                        long redispatchPeriodMs, double redispatchRampShare) {
    public AreaSetup {
        costs = List.copyOf(costs);
        if (ace == null || regulation == null) {
            throw new IllegalArgumentException("ace and regulation settings are required");
        }
        if (redispatchPeriodMs < 0) {
            throw new IllegalArgumentException("area " + ace.areaId() + ": redispatchPeriodMs must be >= 0");
        }
        if (redispatchPeriodMs > 0 && costs.isEmpty()) {
            throw new IllegalArgumentException("area " + ace.areaId() + ": re-dispatch needs cost curves");
        }
    }

    /** Area without costs or re-dispatch. */
    public static AreaSetup of(AreaControlSettings ace, RegulationSettings regulation) {
        return new AreaSetup(ace, regulation, List.of(), 0, 1.0);
    }
}
