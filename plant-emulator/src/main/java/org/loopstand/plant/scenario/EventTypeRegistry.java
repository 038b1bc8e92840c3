package org.loopstand.plant.scenario;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Set;

import org.loopstand.protocol.config.MappingReader;

/**
 * Maps an event's {@code type} in a scenario file to the parser that reads the rest of its keys.
 * Other modules add their own types with {@link #register}.
 */
public final class EventTypeRegistry {
    /** Reads one event's own keys ({@code atS} and {@code type} are read already). */
    @FunctionalInterface
    public interface EventParser {
        ScenarioEvent parse(double atS, MappingReader keys);
    }

    private final Map<String, EventParser> parsers = new LinkedHashMap<>();

    /**
     * @return a registry with the physics events loadStep, loadRamp, unitTrip and setLoadReference, and
     *         the plant events scheduleChange and modeChange ({@link PlantEvents}; without a plant on
     *         the bus they only reach the run record)
     */
    public static EventTypeRegistry physics() {
        EventTypeRegistry r = new EventTypeRegistry();
        r.register("loadStep", (at, k) -> new PhysicsEvents.LoadStep(at, k.requiredString("area"), k.requiredDouble("deltaMw")));
        r.register("loadRamp", (at, k) -> new PhysicsEvents.LoadRamp(at, k.requiredString("area"), k.requiredDouble("deltaMw"),
                k.requiredDouble("durationS")));
        r.register("unitTrip", (at, k) -> new PhysicsEvents.UnitTrip(at, k.requiredString("unit")));
        r.register("setLoadReference", (at, k) -> new PhysicsEvents.SetLoadReference(at, k.requiredString("unit"),
                k.requiredDouble("mw")));
        r.register("scheduleChange", PlantEvents::parseScheduleChange);
        r.register("modeChange", PlantEvents::parseModeChange);
        return r;
    }

    /** @throws IllegalArgumentException if the type is already registered */
    public EventTypeRegistry register(String type, EventParser parser) {
        if (parsers.putIfAbsent(type, parser) != null) {
            throw new IllegalArgumentException("event type '" + type + "' is registered already");
        }
        return this;
    }

    public EventParser parser(String type) {
        return parsers.get(type);
    }

    public Set<String> types() {
        return parsers.keySet();
    }
}
