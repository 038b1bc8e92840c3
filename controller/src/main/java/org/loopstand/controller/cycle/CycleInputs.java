package org.loopstand.controller.cycle;

import org.loopstand.controller.intake.AreaCycleInputs;

import java.util.List;
import org.loopstand.controller.allocation.UnitState;

/**
 * @param cycleNumber cycle number (from the scheduler)
 * @param nowMs       controller time at cycle start, epoch ms
 * @param busLinkUp   the bus (broker) connection is up
 * @param areas       inputs of every configured area
 * @param units       state of every unit (all areas)
 */
public record CycleInputs(long cycleNumber, long nowMs, boolean busLinkUp, List<AreaCycleInputs> areas,
                          List<UnitState> units) {
    public CycleInputs {
        areas = List.copyOf(areas);
        units = List.copyOf(units);
    }
}
