package org.loopstand.controller.pulsetest.plan;

import java.util.List;
import java.util.Objects;

/**
 * A unit response test plan as loaded from YAML (see docs/pulse-test.md for the keys).
 *
 * @param name        plan name, e.g. {@code standard}
 * @param description free text
 * @param settings    how pulses are sent and the response measured
 * @param limits      safety caps
 * @param tolerances  what the response is judged against
 * @param steps       the steps in order, at least one
 */
public record TestPlan(String name, String description, PlanSettings settings, PlanLimits limits,
        Tolerances tolerances, List<PlanStep> steps) {
    public TestPlan {
        Objects.requireNonNull(name, "name");
        description = description == null ? "" : description;
        Objects.requireNonNull(settings, "settings");
        Objects.requireNonNull(limits, "limits");
        Objects.requireNonNull(tolerances, "tolerances");
        steps = List.copyOf(steps);
    }
}
