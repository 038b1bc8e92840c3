package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;

import org.loopstand.protocol.message.Ids;

/**
 * One fault, validated: its type, targets, parameters (every parameter of the type present, defaults
 * filled in) and time window in scenario seconds. Build with {@link #builder}.
 *
 * @param id         fault id (scenario fault id or fault order id)
 * @param type       the fault type
 * @param targets    resolved targets, at least one, no repeats
 * @param parameters every parameter of the type: Double for numbers, String for texts
 * @param startS     window start, scenario s, ≥ 0
 * @param endS       window end, scenario s, &gt; startS; +∞ = until stopped
 * @param behaviour  what the fault does, bound to its parameters (typed; the stages read only this)
 */
public record FaultSpec(String id, FaultType type, List<FaultTarget> targets, Map<String, Object> parameters,
                        double startS, double endS, FaultBehaviour behaviour) {
    public FaultSpec {
        targets = List.copyOf(targets);
        parameters = Collections.unmodifiableMap(new LinkedHashMap<>(parameters));
        Objects.requireNonNull(behaviour, "behaviour");
    }

    /** Binds the type's behaviour to {@code parameters}. */
    public FaultSpec(String id, FaultType type, List<FaultTarget> targets, Map<String, Object> parameters,
                     double startS, double endS) {
        this(id, type, targets, parameters, startS, endS, type.bind(parameters));
    }

    public static Builder builder(FaultLibrary library, TargetCatalog catalog) {
        return new Builder(library, catalog);
    }

    /** @return the number parameter (NaN when a parameter documented as "not set" was left out) */
    public double number(String name) {
        Object v = parameters.get(name);
        if (!(v instanceof Double d)) {
            throw new IllegalArgumentException("fault type " + type.name() + " has no number parameter '" + name + "'");
        }
        return d;
    }

    public String text(String name) {
        Object v = parameters.get(name);
        if (!(v instanceof String s)) {
            throw new IllegalArgumentException("fault type " + type.name() + " has no text parameter '" + name + "'");
        }
        return s;
    }

    /** @return which meter of an area target the fault acts on ({@link FaultLibrary#ALL_METERS} = every one); null when the type has none */
    public String meter() {
        Object v = parameters.get("meter");
        return v instanceof String s ? s : null;
    }

    /** @return the meter point for area targets: frequency, netInterchange or a tie id; null when the type has none */
    public String point() {
        Object v = parameters.get("point");
        return v instanceof String s ? s : null;
    }

    /** @return true when {@code other} overlaps this fault in time, shares a target and point, and contradicts it */
    public boolean contradicts(FaultSpec other) {
        if (!type.conflictsWith(other.type) || !(startS < other.endS && other.startS < endS)) {
            return false;
        }
        boolean sharedTarget = targets.stream().anyMatch(t -> other.targets.contains(t));
        return sharedTarget && (point() == null || other.point() == null || point().equals(other.point()))
                && Objects.equals(parameters.get("meter"), other.parameters.get("meter"));
    }

    public boolean targets(TargetKind kind, String targetId) {
        return targets.contains(new FaultTarget(kind, targetId));
    }

    @Override
    public String toString() {
        return type.name() + " '" + id + "' on " + targets + " " + parameters + " [" + startS + ", " + endS + ") s";
    }

    /** A problem found by {@link Builder#problems()}: which input ({@code type}, {@code targets}, {@code window} or a parameter name) and what. */
    public record Problem(String field, String message) {
        @Override
        public String toString() {
            return message;
        }
    }

    /** Collects a fault's parts; {@link #problems()} lists everything wrong at once, {@link #build()} refuses. */
    public static final class Builder {
        private final FaultLibrary library;
        private final TargetCatalog catalog;
        private String id;
        private String typeName;
        private final List<String> targetIds = new ArrayList<>();
        private final Map<String, Object> given = new LinkedHashMap<>();
        private double startS = 0;
        private double endS = Double.POSITIVE_INFINITY;

        private Builder(FaultLibrary library, TargetCatalog catalog) {
            this.library = Objects.requireNonNull(library, "library");
            this.catalog = Objects.requireNonNull(catalog, "catalog");
        }

        public Builder id(String v) {
            id = v;
            return this;
        }

        public Builder type(String v) {
            typeName = v;
            return this;
        }

        public Builder target(String v) {
            targetIds.add(v);
            return this;
        }

        public Builder targets(List<String> v) {
            targetIds.addAll(v);
            return this;
        }

        /** @param value a Number or a String (anything else is refused by {@link #problems()}) */
        public Builder parameter(String name, Object value) {
            given.put(name, value);
            return this;
        }

        public Builder parameters(Map<String, ?> v) {
            given.putAll(v);
            return this;
        }

        /** @param start window start, scenario s; @param end window end, scenario s (+∞ = until stopped) */
        public Builder window(double start, double end) {
            startS = start;
            endS = end;
            return this;
        }

        public List<Problem> problems() {
            List<Problem> out = new ArrayList<>();
            assemble(out);
            return out;
        }

        /** @throws IllegalArgumentException listing every problem */
        public FaultSpec build() {
            List<Problem> out = new ArrayList<>();
            FaultSpec spec = assemble(out);
            if (!out.isEmpty()) {
                throw new IllegalArgumentException("fault " + (id == null ? "" : "'" + id + "' ") + "refused: "
                        + String.join("; ", out.stream().map(Problem::message).toList()));
            }
            return spec;
        }

        private FaultSpec assemble(List<Problem> out) {
            if (!Ids.isValid(id)) {
                out.add(new Problem("id", "fault id " + (id == null ? "is missing" : "'" + id + "' does not match " + Ids.PATTERN.pattern())));
            }
            FaultType type = typeName == null ? null : library.type(typeName).orElse(null);
            if (type == null) {
                out.add(new Problem("type", typeName == null ? "fault type is missing"
                        : "unknown fault type '" + typeName + "'; known types: " + library.names()));
            }
            if (!(startS >= 0) || !(endS > startS)) {
                out.add(new Problem("window", "fault window must satisfy 0 <= startS < endS, got startS=" + startS + " endS=" + endS));
            }
            if (type == null) {
                return null;
            }
            List<FaultTarget> targets = resolveTargets(type, out);
            Map<String, Object> params = resolveParameters(type, targets, out);
            return new FaultSpec(id, type, targets, params, startS, endS);
        }

        private List<FaultTarget> resolveTargets(FaultType type, List<Problem> out) {
            List<FaultTarget> targets = new ArrayList<>();
            if (targetIds.isEmpty()) {
                out.add(new Problem("targets", "a fault needs at least one target"));
            }
            Set<String> seen = new LinkedHashSet<>();
            for (String t : targetIds) {
                if (!seen.add(t)) {
                    out.add(new Problem("targets", "target '" + t + "' is named twice"));
                    continue;
                }
                TargetCatalog.Resolution r = catalog.resolve(t, type.targetKinds());
                r.target().ifPresentOrElse(targets::add, () -> out.add(new Problem("targets", r.problem())));
            }
            if (type.category() == FaultCategory.NETWORK && targetIds.size() != 2) {
                out.add(new Problem("targets", "a " + type.name() + " names the two hosts at the ends of the link, got "
                        + targetIds.size() + " target(s)"));
            }
            return targets;
        }

        private Map<String, Object> resolveParameters(FaultType type, List<FaultTarget> targets, List<Problem> out) {
            Map<String, Object> params = new LinkedHashMap<>();
            for (String name : given.keySet()) {
                if (type.parameter(name).isEmpty()) {
                    out.add(new Problem(name, "fault type " + type.name() + " has no parameter '" + name + "'; it takes "
                            + type.parameters().stream().map(ParameterSpec::name).toList()));
                }
            }
            for (ParameterSpec p : type.parameters()) {
                Object v = given.get(p.name());
                if (v == null) {
                    if (p.required()) {
                        out.add(new Problem(p.name(), "fault type " + type.name() + " needs parameter " + p.name()));
                    }
                    params.put(p.name(), p.defaultValue());
                    continue;
                }
                Object normal = v instanceof Number n ? (Object) n.doubleValue() : v;
                p.check(normal).ifPresentOrElse(w -> out.add(new Problem(p.name(), w)), () -> params.put(p.name(), normal));
            }
            checkPoint(type, targets, params, out);
            return params;
        }

        private void checkPoint(FaultType type, List<FaultTarget> targets, Map<String, Object> params, List<Problem> out) {
            boolean anyArea = targets.stream().anyMatch(t -> t.kind() == TargetKind.AREA);
            boolean anyUnit = targets.stream().anyMatch(t -> t.kind() == TargetKind.UNIT);
            if (given.containsKey("meter") && !anyArea) {
                out.add(new Problem("meter", "parameter meter applies to area targets only"));
            }
            if (!(params.get("point") instanceof String point)) {
                return;
            }
            if (given.containsKey("point") && anyUnit) {
                out.add(new Problem("point", "parameter point applies to area targets only (unit targets act on outputMw)"));
            }
            for (FaultTarget t : targets) {
                if (t.kind() == TargetKind.AREA && !point.equals(FaultLibrary.POINT_FREQUENCY)
                        && !point.equals(FaultLibrary.POINT_NET_INTERCHANGE) && !catalog.tieTouches(point, t.id())) {
                    out.add(new Problem("point", "point '" + point + "' is not frequency, netInterchange or a tie of area "
                            + t.id() + " (ties: " + catalog.ties() + ")"));
                }
            }
            if (type.behaviour() == ValueFault.StuckAt.class) {
                boolean needsHz = anyArea && point.equals(FaultLibrary.POINT_FREQUENCY);
                boolean needsMw = anyUnit || (anyArea && !point.equals(FaultLibrary.POINT_FREQUENCY));
                if (needsHz && Double.isNaN((Double) params.get("valueHz"))) {
                    out.add(new Problem("valueHz", "stuckAt on a frequency needs valueHz"));
                }
                if (needsMw && Double.isNaN((Double) params.get("valueMw"))) {
                    out.add(new Problem("valueMw", "stuckAt on a MW point needs valueMw"));
                }
            }
        }
    }
}
