package org.loopstand.plant.scenario;

import org.loopstand.plant.physics.GridSimulator;

/** What an event can act on. Later work (faults, bus) extends this with more targets. */
public interface ScenarioContext {
    GridSimulator grid();
}
