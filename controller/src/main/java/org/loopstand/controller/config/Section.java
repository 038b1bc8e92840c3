package org.loopstand.controller.config;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;

/**
 * Reads keys of one YAML mapping, collecting problems with {@code file:line} instead of throwing.
 * In a strict section {@link #finish()} reports keys that were never asked for (typos).
 */
final class Section {
    private final LocatedYaml yaml;
    private final JsonNode node;
    private final String pointer;
    private final String what;
    private final List<String> problems;
    private final Set<String> known = new LinkedHashSet<>();

    Section(LocatedYaml yaml, JsonNode node, String pointer, String what, List<String> problems) {
        this.yaml = yaml;
        this.node = node;
        this.pointer = pointer;
        this.what = what;
        this.problems = problems;
        if (node != null && !node.isObject()) {
            problems.add(yaml.where(pointer) + ": " + what + " must be a mapping");
        }
    }

    private JsonNode get(String key) {
        known.add(key);
        return node == null || !node.isObject() ? null : node.get(key);
    }

    boolean has(String key) {
        JsonNode v = get(key);
        return v != null && !v.isNull();
    }

    Section section(String key) {
        JsonNode v = get(key);
        return new Section(yaml, v == null || v.isNull() ? null : v, pointer + "/" + key, what + "." + key, problems);
    }

    List<Section> list(String key, boolean required) {
        JsonNode v = get(key);
        List<Section> out = new ArrayList<>();
        if (v == null || v.isNull()) {
            if (required) {
                problems.add(yaml.where(pointer) + ": " + what + " needs a list '" + key + "'");
            }
            return out;
        }
        if (!v.isArray()) {
            problems.add(yaml.where(pointer + "/" + key) + ": " + key + " of " + what + " must be a list");
            return out;
        }
        for (int i = 0; i < v.size(); i++) {
            JsonNode item = v.get(i);
            String id = item.hasNonNull("id") ? item.get("id").asText() : "#" + (i + 1);
            out.add(new Section(yaml, item, pointer + "/" + key + "/" + i, key + " entry " + id, problems));
        }
        return out;
    }

    String requiredString(String key) {
        JsonNode v = get(key);
        if (v == null || v.isNull() || !v.isValueNode()) {
            problems.add(yaml.where(pointer) + ": " + what + " needs '" + key + "'");
            return null;
        }
        return v.asText();
    }

    String string(String key, String dflt) {
        JsonNode v = get(key);
        return v == null || v.isNull() ? dflt : v.asText();
    }

    double dbl(String key, double dflt) {
        JsonNode v = get(key);
        if (v == null || v.isNull()) {
            return dflt;
        }
        if (!v.isNumber()) {
            problems.add(yaml.where(pointer + "/" + key) + ": " + key + " of " + what + " must be a number, got '"
                    + v.asText() + "'");
            return dflt;
        }
        return v.doubleValue();
    }

    double requiredDouble(String key) {
        if (!has(key)) {
            problems.add(yaml.where(pointer) + ": " + what + " needs '" + key + "'");
            return Double.NaN;
        }
        return dbl(key, Double.NaN);
    }

    long lng(String key, long dflt) {
        double d = dbl(key, dflt);
        if (d != Math.rint(d)) {
            problems.add(yaml.where(pointer + "/" + key) + ": " + key + " of " + what + " must be a whole number");
        }
        return (long) d;
    }

    boolean bool(String key, boolean dflt) {
        JsonNode v = get(key);
        if (v == null || v.isNull()) {
            return dflt;
        }
        if (!v.isBoolean()) {
            problems.add(yaml.where(pointer + "/" + key) + ": " + key + " of " + what + " must be true or false");
            return dflt;
        }
        return v.booleanValue();
    }

    /** Records a problem at {@code key}'s line. */
    void fail(String key, String message) {
        problems.add(yaml.where(pointer + "/" + key) + ": " + key + " of " + what + " " + message);
    }

    /** Records a problem at this section's line. */
    void fail(String message) {
        problems.add(yaml.where(pointer) + ": " + what + ": " + message);
    }

    /** Reports keys never asked for. */
    void finish() {
        if (node == null || !node.isObject()) {
            return;
        }
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!known.contains(k)) {
                problems.add(yaml.where(pointer + "/" + k) + ": unknown key '" + k + "' in " + what
                        + "; allowed here: " + known);
            }
        }
    }
}
