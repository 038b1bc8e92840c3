package org.loopstand.plant.scenario;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

import com.fasterxml.jackson.core.JsonToken;
import org.loopstand.plant.check.CheckLibrary;
import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.check.CheckType;
import org.loopstand.plant.fault.FaultCategory;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultSpec;
import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.fault.NetworkFault;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.grid.Grid;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.SourceLocation;
import org.loopstand.protocol.config.YamlNode;

/**
 * Reads a whole rehearsal scenario: the physics keys of {@link ScenarioLoader} plus {@code rateX},
 * {@code faults:} and {@code checks:}. A fault is {@code {id, type, targets | target, startS, endS |
 * durationS, <its parameters>}}; a check is {@code {name, type, <its parameters>}} where {@code after}
 * names an event type or a fault id. Every problem is reported as {@code file:line:column: what} (a {@link org.loopstand.protocol.config.ConfigFileException}):
 * unknown types, targets, parameters, times past the run's end, contradictory overlapping faults.
 */
public final class RunScenarioLoader {
    private static final Set<String> FAULT_KEYS = Set.of("id", "type", "targets", "target", "startS", "endS", "durationS");

    private RunScenarioLoader() {
    }

    public static RunScenario load(Path file, EventTypeRegistry registry, Grid grid) throws IOException {
        return load(file, registry, grid, HostLinks.NONE);
    }

    /**
     * @param hostLinks the hosts network faults may name, and whether each can be applied here (a
     *                  {@code linkDelayLoss} on a kernel without netem is refused at its file:line:column)
     */
    public static RunScenario load(Path file, EventTypeRegistry registry, Grid grid, HostLinks hostLinks) throws IOException {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return load(file.toString(), r, registry, grid, hostLinks);
        }
    }

    /**
     * @return {@code file: warning: …} for each area that starts out of balance by more than its tolerance but
     *         less than runs refuse ({@link org.loopstand.plant.physics.StartBalance})
     */
    public static List<String> startWarnings(Path file, RunScenario scenario, Grid grid) {
        return org.loopstand.plant.physics.StartBalance.of(grid, scenario.scenario().startHourOfDay()).warnings().stream()
                .map(w -> file + ": warning: " + w).toList();
    }

    public static RunScenario load(String fileName, Reader reader, EventTypeRegistry registry, Grid grid) throws IOException {
        return load(fileName, reader, registry, grid, HostLinks.NONE);
    }

    public static RunScenario load(String fileName, Reader reader, EventTypeRegistry registry, Grid grid, HostLinks hostLinks)
            throws IOException {
        Extras extras = new Extras(FaultLibrary.standard(), CheckLibrary.standard(), hostLinks);
        Scenario s = ScenarioLoader.load(fileName, reader, registry, grid, extras);
        return new RunScenario(s, extras.rateX, extras.faults, extras.checks);
    }

    private static final class Extras implements ScenarioLoader.Sections {
        final FaultLibrary faultLibrary;
        final CheckLibrary checkLibrary;
        double rateX = 1.0;
        final List<FaultSpec> faults = new ArrayList<>();
        final List<CheckSpec> checks = new ArrayList<>();

        final HostLinks hostLinks;

        Extras(FaultLibrary faultLibrary, CheckLibrary checkLibrary, HostLinks hostLinks) {
            this.faultLibrary = faultLibrary;
            this.checkLibrary = checkLibrary;
            this.hostLinks = hostLinks;
        }

        @Override
        public void read(MappingReader top, double durationS, List<ScenarioEvent> events, Grid grid, List<String> problems) {
            rateX = top.optionalDouble("rateX", 1.0);
            if (!(rateX > 0 && rateX <= 1000)) {
                problems.add(top.locationOf("rateX") + ": rateX must lie in (0, 1000], got " + rateX);
            }
            TargetCatalog catalog = TargetCatalog.of(grid).withHosts(hostLinks.hosts());
            List<SourceLocation> faultAt = new ArrayList<>();
            for (YamlNode n : top.sequence("faults", false)) {
                readFault(n, durationS, catalog, problems, faultAt);
            }
            for (int i = 0; i < faults.size(); i++) {
                for (int j = 0; j < i; j++) {
                    if (faults.get(i).contradicts(faults.get(j))) {
                        problems.add(faultAt.get(i) + ": fault '" + faults.get(i).id() + "' (" + faults.get(i).type().name()
                                + ") contradicts fault '" + faults.get(j).id() + "' (" + faults.get(j).type().name()
                                + ", line " + faultAt.get(j).line() + "): same target at overlapping times");
                    }
                }
            }
            // event types as written, refused ones too: a check after one of those is not a second problem
            Set<String> written = new HashSet<>();
            for (YamlNode n : top.sequence("events", false)) {
                if (n instanceof YamlNode.Mapping m) {
                    m.text("type").ifPresent(written::add);
                }
            }
            Set<String> names = new HashSet<>();
            for (YamlNode n : top.sequence("checks", false)) {
                readCheck(n, durationS, events, written, catalog, problems, names);
            }
        }

        private void readFault(YamlNode n, double durationS, TargetCatalog catalog, List<String> problems,
                List<SourceLocation> faultAt) {
            MappingReader r = new MappingReader(n, "fault", problems);
            String id = r.requiredString("id");
            String type = r.requiredString("type");
            List<String> targets = new ArrayList<>();
            if (r.has("target")) {
                targets.add(r.requiredString("target"));
            }
            for (YamlNode t : r.sequence("targets", false)) {
                if (t instanceof YamlNode.Scalar sc && sc.token() == JsonToken.VALUE_STRING) {
                    targets.add(sc.text());
                } else {
                    problems.add(t.location() + ": targets of fault must be ids");
                }
            }
            double startS = r.requiredDouble("startS");
            double endS = r.optionalDouble("endS", Double.NaN);
            double lengthS = r.optionalDouble("durationS", Double.NaN);
            if (!Double.isNaN(endS) && !Double.isNaN(lengthS)) {
                problems.add(r.locationOf("durationS") + ": fault " + id + ": give endS or durationS, not both");
            } else if (Double.isNaN(endS) && !Double.isNaN(lengthS)) {
                endS = startS + lengthS;
            } else if (Double.isNaN(endS) && !r.failed("endS")) {
                problems.add(r.location() + ": fault " + id + " is missing 'endS' (or 'durationS')");
            }
            if (endS > durationS) {
                problems.add(r.locationOf(r.has("endS") ? "endS" : "durationS") + ": fault " + id + " ends at " + endS
                        + " s, past the run's end (durationS " + durationS + " s)");
            }
            Map<String, Object> params = parameters(n, r, problems);
            r.finish();
            if (id == null || type == null || Double.isNaN(startS) || Double.isNaN(endS)) {
                return;
            }
            FaultSpec.Builder b = FaultSpec.builder(faultLibrary, catalog).id(id).type(type).targets(targets)
                    .parameters(params).window(startS, endS);
            List<FaultSpec.Problem> wrong = b.problems();
            for (FaultSpec.Problem p : wrong) {
                problems.add(where(r, p.field()) + ": fault " + id + ": " + p.message());
            }
            if (wrong.isEmpty()) {
                if (faults.stream().anyMatch(f -> f.id().equals(id))) {
                    problems.add(r.locationOf("id") + ": fault id '" + id + "' is used twice");
                    return;
                }
                FaultSpec spec = b.build();
                if (spec.behaviour() instanceof NetworkFault nf) {
                    hostLinks.cannotApply(nf, spec.targets().get(0).id(), spec.targets().get(1).id()).ifPresent(why ->
                            problems.add(r.locationOf("type") + ": fault " + id + " (" + type + ") cannot be applied here: " + why));
                }
                faults.add(spec);
                faultAt.add(r.location());
            }
        }

        private void readCheck(YamlNode n, double durationS, List<ScenarioEvent> events, Set<String> writtenEventTypes,
                TargetCatalog catalog, List<String> problems, Set<String> names) {
            MappingReader r = new MappingReader(n, "check", problems);
            String type = r.requiredString("type");
            String name = r.optionalString("name", type);
            Map<String, Object> params = parameters(n, r, problems, "name", "type");
            r.finish();
            if (type == null) {
                return;
            }
            CheckType ct = checkLibrary.type(type).orElse(null);
            if (ct == null) {
                problems.add(r.locationOf("type") + ": unknown check type '" + type + "'; known types: " + checkLibrary.names());
                return;
            }
            if (!names.add(name)) {
                problems.add(r.locationOf("name") + ": check name '" + name + "' is used twice");
            }
            if (params.get("after") instanceof String after) {
                if (params.containsKey("afterS")) {
                    problems.add(r.locationOf("after") + ": check " + name + ": give afterS or after, not both");
                }
                Double at = momentOf(after, events);
                if (at == null && writtenEventTypes.contains(after) || at != null && at < 0) {
                    return; // its event was refused at its own line (a negative atS too): that refusal says what to fix
                }
                if (at == null) {
                    problems.add(r.locationOf("after") + ": check " + name + ": after '" + after
                            + "' is neither an event type of this scenario nor a fault id (events: "
                            + events.stream().map(ScenarioEvent::type).distinct().toList() + ", faults: "
                            + faults.stream().map(FaultSpec::id).toList() + ")");
                    return;
                } else {
                    params.put("afterS", at);
                }
            }
            List<FaultSpec.Problem> wrong = new ArrayList<>();
            CheckSpec spec = CheckSpec.assemble(name, ct, params, catalog, wrong);
            for (FaultSpec.Problem p : wrong) {
                problems.add(where(r, p.field()) + ": check " + name + ": " + p.message());
            }
            if (!wrong.isEmpty()) {
                return;
            }
            if (ct.needsAfter() && spec.number("afterS") + spec.number("withinS") > durationS) {
                problems.add(r.location() + ": check " + name + ": its window ends at "
                        + (spec.number("afterS") + spec.number("withinS")) + " s (afterS + withinS), past the run's end (durationS "
                        + durationS + " s)");
            }
            if (type.equals("noPulseWhileStale") && faults.stream().noneMatch(f -> staleOn(f, spec.text("area")))) {
                problems.add(where(r, "area") + ": check " + name + ": no stale or loss fault of this scenario acts on the meters of "
                        + spec.text("area") + " (nor a value fault)");
            }
            checks.add(spec);
        }

        private static boolean staleOn(FaultSpec f, String area) {
            FaultCategory c = f.type().category();
            return ((c == FaultCategory.STALE || c == FaultCategory.LOSS || c == FaultCategory.VALUE)
                    && f.targets().stream().anyMatch(t -> t.id().equals(area)))
                    || (c == FaultCategory.CONNECTION && f.targets().stream().anyMatch(t -> t.id().equals(TargetCatalog.PLANT_CONNECTION)));
        }

        private Double momentOf(String after, List<ScenarioEvent> events) {
            for (FaultSpec f : faults) {
                if (f.id().equals(after)) {
                    return f.startS();
                }
            }
            return events.stream().filter(e -> e.type().equals(after)).map(ScenarioEvent::atS).min(Double::compare).orElse(null);
        }

        /** @return the mapping's scalar keys other than the fixed ones, as numbers or texts */
        private static Map<String, Object> parameters(YamlNode n, MappingReader r, List<String> problems, String... fixed) {
            Set<String> skip = new HashSet<>(fixed.length > 0 ? Set.of(fixed) : FAULT_KEYS);
            Map<String, Object> out = new LinkedHashMap<>();
            if (!(n instanceof YamlNode.Mapping m)) {
                return out;
            }
            for (Map.Entry<String, YamlNode.Entry> e : m.entries().entrySet()) {
                if (skip.contains(e.getKey())) {
                    continue;
                }
                r.allow(e.getKey());
                if (e.getValue().value() instanceof YamlNode.Scalar sc && sc.token() != JsonToken.VALUE_NULL) {
                    boolean number = sc.token() == JsonToken.VALUE_NUMBER_INT || sc.token() == JsonToken.VALUE_NUMBER_FLOAT;
                    out.put(e.getKey(), number ? (Object) Double.parseDouble(sc.text()) : sc.text());
                } else {
                    problems.add(e.getValue().keyLocation() + ": " + e.getKey() + " must be a single number or text");
                }
            }
            return out;
        }

        private static SourceLocation where(MappingReader r, String field) {
            return switch (field) {
                case "targets" -> r.locationOf(r.has("target") ? "target" : "targets");
                case "window" -> r.locationOf("startS");
                default -> r.locationOf(field);
            };
        }
    }
}
