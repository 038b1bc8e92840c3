package org.loopstand.controller.config;

import java.util.List;

/** A controller site file that cannot be used; every problem is named with {@code file:line}. */
public final class ControllerConfigException extends RuntimeException {
    private static final long serialVersionUID = 1L;
    private final List<String> problems;

    public ControllerConfigException(List<String> problems) {
        super(String.join("\n", problems));
        this.problems = List.copyOf(problems);
    }

    public List<String> problems() {
        return problems;
    }
}
