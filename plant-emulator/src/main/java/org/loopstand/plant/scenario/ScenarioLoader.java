package org.loopstand.plant.scenario;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.physics.Integrator;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;

/**
 * Reads a scenario file and checks it against the site: keys {@code siteId} (the old spelling
 * {@code site} still accepted, see {@link org.loopstand.protocol.config.OldKeys#SCENARIO}), {@code durationS, seed,
 * startHourOfDay, traceIntervalS, stepS, integrator, events}; each event has {@code atS}, {@code type} and the
 * type's own keys. Every problem is reported as {@code file:line:column: what}.
 */
public final class ScenarioLoader {
    private ScenarioLoader() {
    }

    public static Scenario load(Path file, EventTypeRegistry registry, Grid grid) throws IOException {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return load(file.toString(), r, registry, grid);
        }
    }

    public static Scenario load(String fileName, Reader reader, EventTypeRegistry registry, Grid grid) throws IOException {
        return load(fileName, reader, registry, grid, null);
    }

    /**
     * Reads the top-level keys other modules own (faults, checks, …) in the same pass, so that their
     * problems are reported together with the physics' and no key is left unknown.
     */
    public interface Sections {
        /**
         * @param top       the scenario's top mapping (read the section's keys from it)
         * @param durationS the run's duration, s (NaN if it was refused)
         * @param events    the events read so far, sorted or not
         * @param problems  where to add {@code file:line:column: what} problems
         */
        void read(MappingReader top, double durationS, List<ScenarioEvent> events, Grid grid, List<String> problems);
    }

    /** As {@link #load(String, Reader, EventTypeRegistry, Grid)}, also reading {@code sections} (may be null). */
    public static Scenario load(String fileName, Reader reader, EventTypeRegistry registry, Grid grid, Sections sections)
            throws IOException {
        List<String> problems = new ArrayList<>();
        MappingReader top = new MappingReader(YamlNode.read(fileName, reader), "the scenario", problems);
        String siteKey = top.renamedKey("site", "siteId"); // OldKeys.SCENARIO tells about the old spelling
        String site = top.requiredString(siteKey);
        if (site != null && !site.equals(grid.siteId())) {
            problems.add(top.locationOf(siteKey) + ": the scenario is for site '" + site + "' but the site file is '"
                    + grid.siteId() + "'");
        }
        double durationS = top.requiredDouble("durationS");
        if (!(durationS > 0) && !top.failed("durationS")) {
            problems.add(top.locationOf("durationS") + ": durationS must be greater than 0 s, got " + durationS);
        }
        long seed = top.optionalLong("seed", 0L);
        double startHour = top.optionalDouble("startHourOfDay", 0.0);
        if (!(startHour >= 0 && startHour < 24)) {
            problems.add(top.locationOf("startHourOfDay") + ": startHourOfDay must lie in [0, 24), got " + startHour);
        } else {
            // a start far out of balance judges the file, not the controller (StartBalance)
            org.loopstand.plant.physics.StartBalance.of(grid, startHour).problems()
                    .forEach(p -> problems.add(top.locationOf(siteKey) + ": " + p));
        }
        double traceIntervalS = top.optionalDouble("traceIntervalS", 1.0);
        if (!(traceIntervalS > 0)) {
            problems.add(top.locationOf("traceIntervalS") + ": traceIntervalS must be greater than 0 s, got " + traceIntervalS);
        }
        double stepS = top.optionalDouble("stepS", Double.NaN);
        Integrator integrator = Integrator.RK4;
        String integratorName = top.optionalString("integrator", null);
        if (integratorName != null) {
            try {
                integrator = Integrator.parse(integratorName);
            } catch (IllegalArgumentException e) {
                problems.add(top.locationOf("integrator") + ": " + e.getMessage());
            }
        }
        List<ScenarioEvent> events = new ArrayList<>();
        for (YamlNode n : top.sequence("events", false)) {
            MappingReader e = new MappingReader(n, "event", problems);
            double atS = e.requiredDouble("atS");
            if (!(atS >= 0) && !e.failed("atS")) {
                problems.add(e.locationOf("atS") + ": atS must be 0 or more, got " + atS);
            } else if (atS >= durationS) {
                problems.add(e.locationOf("atS") + ": atS " + atS + " s is not before the run's end (durationS " + durationS + " s)");
            }
            String type = e.requiredString("type");
            if (type == null) {
                continue;
            }
            EventTypeRegistry.EventParser parser = registry.parser(type);
            if (parser == null) {
                problems.add(e.locationOf("type") + ": unknown event type '" + type + "'; known types: " + registry.types());
                continue;
            }
            int before = problems.size();
            ScenarioEvent event = parser.parse(atS, e);
            e.finish();
            if (problems.size() == before) {
                Optional<String> wrong = event.check(grid);
                wrong.ifPresent(w -> problems.add(e.location() + ": " + type + " event: " + w));
                events.add(event);
            }
        }
        if (sections != null) {
            sections.read(top, durationS, events, grid, problems);
        }
        top.finish();
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
        return new Scenario(site, durationS, seed, startHour, traceIntervalS, stepS, integrator, events);
    }
}
