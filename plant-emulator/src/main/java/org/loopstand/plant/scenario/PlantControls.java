package org.loopstand.plant.scenario;

import org.loopstand.protocol.message.ControlMode;

/** What scenario events can ask of the plant on the bus (beyond the physics). */
public interface PlantControls {
    /**
     * Publishes a retained {@code Schedule} for the area, effective now.
     *
     * @param scheduledNetInterchangeMw scheduled net interchange, MW, + = export
     * @param scheduledFrequencyHz      scheduled frequency, Hz, [40, 70]
     */
    void publishSchedule(String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz);

    /** Puts the unit's plant interface in {@code mode} (as an operator at the plant would). */
    void setControlMode(String unit, ControlMode mode, String why);
}
