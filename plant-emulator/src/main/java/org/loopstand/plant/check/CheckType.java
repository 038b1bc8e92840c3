package org.loopstand.plant.check;

import java.util.List;
import java.util.Optional;

import org.loopstand.plant.fault.ParameterSpec;

/**
 * A kind of check.
 *
 * @param name           as written in a scenario's {@code checks:}
 * @param parameters     its parameters (names carry units); {@code area}, {@code tie}, {@code unit} name site ids
 * @param controllerSide true when it judges the controller's own published decisions rather than the plant side
 * @param needsAfter     true when it measures from a moment given by {@code afterS} or {@code after}
 * @param description    one line for docs
 * @param evaluator      how it is decided
 */
public record CheckType(String name, List<ParameterSpec> parameters, boolean controllerSide, boolean needsAfter,
                        String description, CheckEvaluator evaluator) {
    public CheckType {
        parameters = List.copyOf(parameters);
    }

    public Optional<ParameterSpec> parameter(String parameterName) {
        return parameters.stream().filter(p -> p.name().equals(parameterName)).findFirst();
    }
}
