package org.loopstand.protocol.config;

import java.util.Comparator;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * A configuration file (site, scenario, plan, controller settings, wire profile, ...) was refused; the
 * message lists every problem, one a line, as {@code file:line:column: what}, in file order.
 */
public final class ConfigFileException extends RuntimeException {
    private final transient List<String> problems;

    private static final Pattern LINE = Pattern.compile(":(\\d+):(\\d+): ");

    /** @param problems each {@code file:line:column: what}; reported in line order */
    public ConfigFileException(List<String> problems) {
        super(String.join("\n", sorted(problems)));
        this.problems = sorted(problems);
    }

    private static List<String> sorted(List<String> problems) {
        return problems.stream().sorted(Comparator.comparingLong(ConfigFileException::position)).toList();
    }

    private static long position(String problem) {
        Matcher m = LINE.matcher(problem);
        return m.find() ? Long.parseLong(m.group(1)) * 100_000 + Long.parseLong(m.group(2)) : 0;
    }

    /** @throws ConfigFileException listing {@code problems} when there is any */
    public static void throwIfAny(List<String> problems) {
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
    }

    public List<String> problems() {
        return problems;
    }
}
