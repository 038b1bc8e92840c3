package org.loopstand.plant.fault;

import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * A kind of fault the rig can inject.
 *
 * @param name           name used in scenarios, fault orders and the command line, e.g. {@code delay}
 * @param category       which stage applies it
 * @param targetKinds    what its targets may name
 * @param parameters     its parameters (names carry units)
 * @param exclusiveGroup faults of the same group may not overlap in time on the same target (they
 *                       contradict each other); every type also excludes itself. Null = only itself.
 * @param description    one line for docs and {@code fault list}
 */
public record FaultType(String name, FaultCategory category, Set<TargetKind> targetKinds,
                        List<ParameterSpec> parameters, String exclusiveGroup, String description) {
    public FaultType {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(category, "category");
        targetKinds = Set.copyOf(targetKinds);
        parameters = List.copyOf(parameters);
    }

    public Optional<ParameterSpec> parameter(String parameterName) {
        return parameters.stream().filter(p -> p.name().equals(parameterName)).findFirst();
    }

    /** @return whether this type and {@code other} contradict each other on a shared target */
    public boolean conflictsWith(FaultType other) {
        return name.equals(other.name) || (exclusiveGroup != null && exclusiveGroup.equals(other.exclusiveGroup));
    }
}
