package org.loopstand.controller.runtime;

import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.loopstand.controller.cycle.CycleOutcome;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.protocol.message.ExcludedUnit;

/** The units out of the allocation with the figures of their exclusion, as the status lists them. */
final class ExclusionList {
    private final Map<String, ExcludedUnit> excluded = new TreeMap<>();

    /** Takes in one cycle's decisions and drops the units the cycle no longer excludes. */
    void update(CycleOutcome o) {
        for (FollowingDecision d : o.decisions()) {
            if (d.event().equals(FollowingDecision.EXCLUDED)) {
                // an exclusion for commands that did not land has no shortfall: 0
                double shortfallMw = Double.isFinite(d.shortfallMw())
                        ? Math.max(-1e6, Math.min(1e6, d.shortfallMw())) : 0.0;
                excluded.put(d.unitId(), new ExcludedUnit(d.unitId(), d.areaId(), d.reason(), shortfallMw));
            }
        }
        excluded.keySet().retainAll(o.excludedUnits());
    }

    /** @return the excluded units, sorted by id */
    List<ExcludedUnit> units() {
        return List.copyOf(excluded.values());
    }
}
