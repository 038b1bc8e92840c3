package org.loopstand.plant.scenario;

import java.util.Optional;

import org.loopstand.plant.grid.Grid;

/**
 * Something that happens at a scenario time. Open for extension: register a parser for a new
 * {@code type} in {@link EventTypeRegistry}.
 */
public interface ScenarioEvent {
    /** @return scenario time at which the event fires, s, ≥ 0 */
    double atS();

    /** @return the event's type name as written in the scenario file */
    String type();

    /** @return what is wrong with this event for {@code grid} (unknown area, unit, …), if anything */
    Optional<String> check(Grid grid);

    /** Acts on the run; called once, at the first step boundary at or after {@link #atS()}. */
    void apply(ScenarioContext context);
}
