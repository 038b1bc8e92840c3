package org.loopstand.controller.pulsetest.plan;

import java.util.List;
import java.util.Set;
import java.util.TreeSet;

/** Reads typed values out of one YAML mapping, collecting every problem as {@code file:line: message}. */
final class MapReader {
    private final PlanNode.MapNode map;
    private final String source;
    private final String where;
    private final List<String> problems;

    MapReader(PlanNode.MapNode map, String source, String where, List<String> problems) {
        this.map = map;
        this.source = source;
        this.where = where;
        this.problems = problems;
    }

    /** Reports every key not in {@code allowed}. */
    void refuseUnknown(Set<String> allowed) {
        for (String key : map.entries().keySet()) {
            if (!allowed.contains(key)) {
                problem(map.keyLines().get(key), "unknown key '" + key + "' in " + where + " (allowed: "
                        + String.join(", ", new TreeSet<>(allowed)) + ")");
            }
        }
    }

    boolean has(String key) {
        return map.entries().containsKey(key);
    }

    int lineOf(String key) {
        Integer l = map.keyLines().get(key);
        return l == null ? map.line() : l;
    }

    PlanNode node(String key) {
        return map.entries().get(key);
    }

    String text(String key, String fallback) {
        PlanNode n = node(key);
        if (n == null) {
            return fallback;
        }
        if (n instanceof PlanNode.ScalarNode s && s.text() != null) {
            return s.text();
        }
        problem(lineOf(key), where + "." + key + " must be a text value");
        return fallback;
    }

    /** @return the number, or {@code fallback} when absent or wrong (then a problem is recorded) */
    double number(String key, double fallback, double min, double max) {
        PlanNode n = node(key);
        if (n == null) {
            return fallback;
        }
        double v;
        try {
            if (!(n instanceof PlanNode.ScalarNode s) || s.text() == null) {
                throw new NumberFormatException();
            }
            v = Double.parseDouble(s.text());
        } catch (NumberFormatException e) {
            problem(lineOf(key), where + "." + key + " must be a number");
            return fallback;
        }
        if (!Double.isFinite(v) || v < min || v > max) {
            problem(lineOf(key), where + "." + key + " = " + v + " is outside [" + fmt(min) + ", " + fmt(max) + "]");
            return fallback;
        }
        return v;
    }

    /** A number that must be above zero. */
    double positive(String key, double fallback, double max) {
        double v = number(key, fallback, Double.MIN_VALUE, max);
        return v;
    }

    long whole(String key, long fallback, long min, long max) {
        double v = number(key, fallback, min, max);
        if (v != Math.rint(v)) {
            problem(lineOf(key), where + "." + key + " = " + v + " must be a whole number");
            return fallback;
        }
        return (long) v;
    }

    void problem(int line, String message) {
        problems.add(source + ":" + line + ": " + message);
    }

    private static String fmt(double v) {
        if (v == Double.MIN_VALUE) {
            return "> 0";
        }
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
