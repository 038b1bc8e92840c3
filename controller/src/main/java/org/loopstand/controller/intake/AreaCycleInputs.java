package org.loopstand.controller.intake;

import org.loopstand.controller.schedule.AreaSchedule;

import java.util.Map;
import org.loopstand.controller.intake.ValidatedValue;

/**
 * One area's inputs for one cycle, already validated by the intake.
 *
 * @param areaId              area id
 * @param frequencyHz         validated area frequency, Hz
 * @param tieFlowsMw          validated flow of every tie of the area, MW, + = export; NIa is their sum
 * @param schedule            the schedule in force, or null if none is known
 * @param timeErrorS          accumulated time error, s (0 if unused)
 * @param inadvertentAccumMwh accumulated inadvertent interchange, MWh (0 if unused)
 */
public record AreaCycleInputs(String areaId, ValidatedValue frequencyHz, Map<String, ValidatedValue> tieFlowsMw,
                              AreaSchedule schedule, double timeErrorS, double inadvertentAccumMwh) {
    public AreaCycleInputs {
        tieFlowsMw = Map.copyOf(tieFlowsMw);
    }
}
