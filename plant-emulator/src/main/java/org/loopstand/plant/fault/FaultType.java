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
 * @param behaviour      what the fault does: a record whose components are this type's own parameters
 */
public record FaultType(String name, FaultCategory category, Set<TargetKind> targetKinds,
                        List<ParameterSpec> parameters, String exclusiveGroup, String description,
                        Class<? extends FaultBehaviour> behaviour) {
    public FaultType {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(category, "category");
        Objects.requireNonNull(behaviour, "behaviour");
        if (!behaviour.isRecord()) {
            throw new IllegalArgumentException("fault type " + name + ": behaviour " + behaviour.getSimpleName() + " is not a record");
        }
        for (var c : behaviour.getRecordComponents()) {
            ParameterSpec p = parameters.stream().filter(x -> x.name().equals(c.getName())).findFirst()
                    .orElseThrow(() -> new IllegalArgumentException("fault type " + name + ": behaviour "
                            + behaviour.getSimpleName() + " reads '" + c.getName() + "', which is not one of its parameters"));
            if ((c.getType() == String.class) != p.text() || (c.getType() != String.class && c.getType() != double.class)) {
                throw new IllegalArgumentException("fault type " + name + ": parameter " + c.getName()
                        + " is a " + (p.text() ? "text" : "number") + " but " + behaviour.getSimpleName() + " reads a "
                        + c.getType().getSimpleName());
            }
        }
        targetKinds = Set.copyOf(targetKinds);
        parameters = List.copyOf(parameters);
    }

    public Optional<ParameterSpec> parameter(String parameterName) {
        return parameters.stream().filter(p -> p.name().equals(parameterName)).findFirst();
    }

    /** @return the behaviour bound to a fault's {@code parameters} (validated; see {@link FaultBehaviour#bind}) */
    @SuppressWarnings({"unchecked", "rawtypes"})
    public FaultBehaviour bind(java.util.Map<String, Object> parameters) {
        return FaultBehaviour.bind((Class) behaviour, parameters);
    }

    /** @return whether this type and {@code other} contradict each other on a shared target */
    public boolean conflictsWith(FaultType other) {
        return name.equals(other.name) || (exclusiveGroup != null && exclusiveGroup.equals(other.exclusiveGroup));
    }
}
