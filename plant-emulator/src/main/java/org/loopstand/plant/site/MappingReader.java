package org.loopstand.plant.site;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

import com.fasterxml.jackson.core.JsonToken;

/**
 * Typed, located access to one YAML mapping. Every problem goes into a shared list instead of
 * stopping at the first; {@link #finish()} reports keys that nobody asked for as unknown.
 */
public final class MappingReader {
    private final YamlNode.Mapping mapping;
    private final List<String> problems;
    private final Set<String> known = new LinkedHashSet<>();
    private final String what;
    private final Set<String> failedKeys = new LinkedHashSet<>();

    /** @param what how to name this mapping in messages, e.g. "unit g1" */
    public MappingReader(YamlNode node, String what, List<String> problems) {
        this.what = what;
        this.problems = problems;
        if (node instanceof YamlNode.Mapping m) {
            mapping = m;
        } else {
            problems.add(node.location() + ": " + what + " must be a mapping of key: value");
            mapping = new YamlNode.Mapping(node.location(), Map.of());
        }
    }

    public SourceLocation location() {
        return mapping.location();
    }

    /** @return where the key is written, or the mapping's own location if it is absent */
    public SourceLocation locationOf(String key) {
        YamlNode.Entry e = mapping.entries().get(key);
        return e != null ? e.keyLocation() : mapping.location();
    }

    public boolean has(String key) {
        known.add(key);
        return mapping.entries().containsKey(key);
    }

    public String requiredString(String key) {
        String s = optionalString(key, null);
        if (s == null && !mapping.entries().containsKey(key)) {
            missing(key);
        }
        return s;
    }

    public String optionalString(String key, String fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() == JsonToken.VALUE_NULL || s.text().isBlank()) {
            failedKeys.add(key);
            problems.add(s.location() + ": " + key + " of " + what + " has no value");
            return fallback;
        }
        return s.text();
    }

    /** @return the number, or NaN (with a problem recorded) when missing or not a number */
    public double requiredDouble(String key) {
        if (!mapping.entries().containsKey(key)) {
            known.add(key);
            missing(key);
            return Double.NaN;
        }
        return optionalDouble(key, Double.NaN);
    }

    public double optionalDouble(String key, double fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() == JsonToken.VALUE_NULL) {
            failedKeys.add(key);
            problems.add(s.location() + ": " + key + " of " + what + " has no value (a number is needed)");
            return Double.NaN;
        }
        if (s.token() != JsonToken.VALUE_NUMBER_INT && s.token() != JsonToken.VALUE_NUMBER_FLOAT) {
            failedKeys.add(key);
            problems.add(s.location() + ": " + key + " of " + what + " must be a number, got '" + s.text() + "'");
            return Double.NaN;
        }
        return Double.parseDouble(s.text());
    }

    public long optionalLong(String key, long fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() != JsonToken.VALUE_NUMBER_INT) {
            problems.add(s.location() + ": " + key + " of " + what + " must be a whole number, got '" + s.text() + "'");
            return fallback;
        }
        return Long.parseLong(s.text());
    }

    public boolean optionalBoolean(String key, boolean fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() != JsonToken.VALUE_TRUE && s.token() != JsonToken.VALUE_FALSE) {
            problems.add(s.location() + ": " + key + " of " + what + " must be true or false, got '" + s.text() + "'");
            return fallback;
        }
        return s.token() == JsonToken.VALUE_TRUE;
    }

    /** @return the list's numbers, or an empty list when absent */
    public List<Double> optionalDoubles(String key) {
        List<Double> out = new ArrayList<>();
        for (YamlNode item : sequence(key, false)) {
            if (item instanceof YamlNode.Scalar s
                    && (s.token() == JsonToken.VALUE_NUMBER_INT || s.token() == JsonToken.VALUE_NUMBER_FLOAT)) {
                out.add(Double.parseDouble(s.text()));
            } else {
                problems.add(item.location() + ": " + key + " of " + what + " must hold numbers only");
            }
        }
        return out;
    }

    /** @return the items of a list of mappings */
    public List<YamlNode> sequence(String key, boolean required) {
        known.add(key);
        YamlNode.Entry e = mapping.entries().get(key);
        if (e == null) {
            if (required) {
                missing(key);
            }
            return List.of();
        }
        if (e.value() instanceof YamlNode.Sequence s) {
            return s.items();
        }
        if (e.value() instanceof YamlNode.Scalar sc && sc.token() == JsonToken.VALUE_NULL) {
            return List.of();
        }
        problems.add(e.keyLocation() + ": " + key + " of " + what + " must be a list");
        return List.of();
    }

    /** @return the value of {@code key} as it is (a mapping with keys of the file's own choosing), if present */
    public java.util.Optional<YamlNode> node(String key) {
        known.add(key);
        YamlNode.Entry e = mapping.entries().get(key);
        return e == null ? java.util.Optional.empty() : java.util.Optional.of(e.value());
    }

    /** Reports every key that was not asked for, with the closest known key as a hint. */
    public void finish() {
        for (Map.Entry<String, YamlNode.Entry> e : mapping.entries().entrySet()) {
            if (!known.contains(e.getKey())) {
                String hint = closest(e.getKey());
                problems.add(e.getValue().keyLocation() + ": unknown key '" + e.getKey() + "' in " + what
                        + (hint != null ? " (did you mean '" + hint + "'?)" : "") + "; allowed here: " + known);
            }
        }
    }

    private YamlNode.Scalar scalar(String key) {
        known.add(key);
        YamlNode.Entry e = mapping.entries().get(key);
        if (e == null) {
            return null;
        }
        if (e.value() instanceof YamlNode.Scalar s) {
            return s;
        }
        problems.add(e.keyLocation() + ": " + key + " of " + what + " must be a single value, not a list or mapping");
        return null;
    }

    /** Records a problem with the value of {@code key} (at the key's line) and marks the key as failed. */
    public void fail(String key, String message) {
        failedKeys.add(key);
        problems.add(locationOf(key) + ": " + key + " of " + what + " " + message);
    }

    /** Marks keys as allowed without reading them (when their meaning depends on a value that was refused). */
    public void allow(String... keys) {
        known.addAll(java.util.List.of(keys));
    }

    /** @return true when the key was missing or of the wrong type (already reported) */
    public boolean failed(String key) {
        return failedKeys.contains(key);
    }

    public String what() {
        return what;
    }

    private void missing(String key) {
        failedKeys.add(key);
        problems.add(mapping.location() + ": " + what + " is missing '" + key + "'");
    }

    private String closest(String key) {
        return closest(key, known);
    }

    /** @return the candidate a mistyped {@code key} most likely meant, or null when none is close */
    public static String closest(String key, java.util.Collection<String> candidates) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String k : candidates) {
            // the usual slip: the unit suffix left off ("droop" for "droopPct")
            if (k.toLowerCase(java.util.Locale.ROOT).startsWith(key.toLowerCase(java.util.Locale.ROOT))) {
                return k;
            }
        }
        for (String k : candidates) {
            int d = distance(key.toLowerCase(java.util.Locale.ROOT), k.toLowerCase(java.util.Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = k;
            }
        }
        return bestDistance <= Math.max(2, key.length() / 3) ? best : null;
    }

    private static int distance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                cur[j] = Math.min(Math.min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + cost);
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }
}
