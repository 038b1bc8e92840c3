package org.loopstand.controller.pulsetest.plan;

import java.util.List;

/** A test plan that cannot be used; lists every problem found, each as {@code file:line: what is wrong}. */
public final class PlanException extends RuntimeException {
    private final List<String> problems;

    public PlanException(List<String> problems) {
        super(problems.size() == 1 ? problems.get(0)
                : problems.size() + " problems in the test plan:\n  " + String.join("\n  ", problems));
        this.problems = List.copyOf(problems);
    }

    /** @return each problem, {@code file:line: message} */
    public List<String> problems() {
        return problems;
    }
}
