package org.loopstand.plant.site;

import java.util.List;

/** A configuration file was refused; the message lists every problem as {@code file:line:column: what}. */
public final class ConfigFileException extends RuntimeException {
    private final transient List<String> problems;

    public ConfigFileException(List<String> problems) {
        super(String.join("\n", problems));
        this.problems = List.copyOf(problems);
    }

    public List<String> problems() {
        return problems;
    }
}
