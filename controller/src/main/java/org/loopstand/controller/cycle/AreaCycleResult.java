package org.loopstand.controller.cycle;

import org.loopstand.controller.ace.AceResult;
import org.loopstand.controller.allocation.Allocation;
import org.loopstand.controller.regulation.RegulationResult;

/**
 * @param areaId      area id
 * @param ace         ACE and its parts; null when its inputs were not usable
 * @param regulation  filter/band/level; null when suspended or ACE unknown
 * @param allocation  unit shares; null when nothing was allocated (suspended, quiet band)
 */
public record AreaCycleResult(String areaId, AceResult ace, RegulationResult regulation, Allocation allocation) {
    /** @return ACE, MW, or NaN when unknown */
    public double aceMw() {
        return ace == null ? Double.NaN : ace.aceMw();
    }
}
