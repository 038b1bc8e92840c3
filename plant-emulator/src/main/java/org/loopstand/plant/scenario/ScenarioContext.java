package org.loopstand.plant.scenario;

import org.loopstand.plant.physics.GridSimulator;

/** What an event can act on. */
public interface ScenarioContext {
    GridSimulator grid();

    /** @return the plant on the bus, or null when the run has none (physics only) */
    default PlantControls plant() {
        return null;
    }

    /** Tells the run (its record, for the checks) that an area's schedule changed now. */
    default void scheduleChanged(String area, double scheduledNetInterchangeMw, double scheduledFrequencyHz) {
    }
}
