package org.loopstand.controller.pulsetest.plan;

import java.util.List;

/**
 * A valid test plan that cannot be run on this unit from where it stands (a step would leave the
 * regulating range); each problem names the plan step as {@code file:line:column}. A plan file that cannot be read is a
 * {@link org.loopstand.protocol.config.ConfigFileException} instead.
 */
public final class PlanException extends RuntimeException {
    private final List<String> problems;

    public PlanException(List<String> problems) {
        super(problems.size() == 1 ? problems.get(0)
                : problems.size() + " problems in the test plan:\n  " + String.join("\n  ", problems));
        this.problems = List.copyOf(problems);
    }

    /** @return each problem, naming the plan step as {@code file:line:column} */
    public List<String> problems() {
        return problems;
    }
}
