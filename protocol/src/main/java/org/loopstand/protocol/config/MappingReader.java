package org.loopstand.protocol.config;

import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

import com.fasterxml.jackson.core.JsonToken;

/**
 * Typed, located access to one YAML mapping of a configuration file. Every problem goes into a shared
 * list as {@code file:line:column: message} instead of stopping at the first; {@link #finish()} reports
 * keys that nobody asked for as unknown, with a "did you mean" hint. The same messages serve every file
 * kind: a missing key ({@code WHAT is missing 'KEY'}), a wrong type ({@code KEY of WHAT must be a number,
 * got 'x'}), a value out of range ({@code KEY of WHAT = V is outside [MIN, MAX]}).
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
        } else if (node instanceof YamlNode.Scalar s && s.token() == JsonToken.VALUE_NULL) {
            mapping = new YamlNode.Mapping(node.location(), Map.of()); // "key:" with nothing under it
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

    /** @return true when the key is written (with any value); marks it as allowed */
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
            fail(s, key, "has no value");
            return fallback;
        }
        return s.text();
    }

    /**
     * @param allowed the words the key may take, in the order the message lists them
     * @return the value, or {@code fallback} when absent or not one of {@code allowed} (then a problem is recorded)
     */
    public String optionalChoice(String key, String fallback, String... allowed) {
        String v = optionalString(key, fallback);
        if (v != null && !List.of(allowed).contains(v)) {
            fail(key, "must be " + orList(allowed) + ", got '" + v + "'" + KeyHints.didYouMean(v, List.of(allowed)));
            return fallback;
        }
        return v;
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

    /** @return the number, or NaN (with a problem recorded) when missing, not a number or outside the range */
    public double requiredDouble(String key, Range range) {
        double v = requiredDouble(key);
        return Double.isNaN(v) || failed(key) ? v : inRange(key, v, range, Double.NaN);
    }

    public double optionalDouble(String key, double fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() == JsonToken.VALUE_NULL) {
            fail(s, key, "has no value (a number is needed)");
            return Double.NaN;
        }
        if (!isNumber(s)) {
            fail(s, key, "must be a number, got '" + s.text() + "'");
            return Double.NaN;
        }
        return Double.parseDouble(s.text());
    }

    /** @return the number, or {@code fallback} when absent, not a number or outside the range (then a problem is recorded) */
    public double optionalDouble(String key, double fallback, Range range) {
        double v = optionalDouble(key, fallback);
        if (!mapping.entries().containsKey(key)) {
            return fallback;
        }
        return failed(key) ? fallback : inRange(key, v, range, fallback);
    }

    /** @return a whole number (written with or without ".0"), or {@code fallback} when absent or wrong */
    public long optionalLong(String key, long fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (isNumber(s) && s.text().matches("[+-]?\\d+")) {
            try {
                return Long.parseLong(s.text().startsWith("+") ? s.text().substring(1) : s.text()); // exact: seeds use all 64 bits
            } catch (NumberFormatException e) {
                fail(s, key, "must be a whole number within ±9223372036854775807, got '" + s.text() + "'");
                return fallback;
            }
        }
        if (!isNumber(s) || Double.parseDouble(s.text()) != Math.rint(Double.parseDouble(s.text()))
                || Math.abs(Double.parseDouble(s.text())) > 9.007199254740992E15) {
            fail(s, key, "must be a whole number, got '" + s.text() + "'");
            return fallback;
        }
        return (long) Double.parseDouble(s.text()); // written as 5.0: exact below 2^53
    }

    /** @return the whole number, or {@code fallback} when absent, wrong or outside the range */
    public long optionalLong(String key, long fallback, Range range) {
        long v = optionalLong(key, fallback);
        if (!mapping.entries().containsKey(key) || failed(key)) {
            return fallback;
        }
        return (long) inRange(key, v, range, fallback);
    }

    public boolean optionalBoolean(String key, boolean fallback) {
        YamlNode.Scalar s = scalar(key);
        if (s == null) {
            return fallback;
        }
        if (s.token() != JsonToken.VALUE_TRUE && s.token() != JsonToken.VALUE_FALSE) {
            fail(s, key, "must be true or false, got '" + s.text() + "'");
            return fallback;
        }
        return s.token() == JsonToken.VALUE_TRUE;
    }

    /** @return the list's numbers, or an empty list when absent */
    public List<Double> optionalDoubles(String key) {
        List<Double> out = new ArrayList<>();
        for (YamlNode item : sequence(key, false)) {
            if (item instanceof YamlNode.Scalar s && isNumber(s)) {
                out.add(Double.parseDouble(s.text()));
            } else {
                failedKeys.add(key);
                problems.add(item.location() + ": " + key + " of " + what + " must hold numbers only");
            }
        }
        return out;
    }

    /** @return the items of a list, or an empty list when absent (a problem when {@code required}) */
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
        fail(key, "must be a list");
        return List.of();
    }

    /**
     * A list of mappings, each read by its own reader named {@code kind ID} (its {@code id} key) or
     * {@code kind #N} (1-based) when it has none.
     */
    public List<MappingReader> mappings(String key, boolean required, String kind) {
        List<MappingReader> out = new ArrayList<>();
        List<YamlNode> items = sequence(key, required);
        for (int i = 0; i < items.size(); i++) {
            YamlNode n = items.get(i);
            String id = n instanceof YamlNode.Mapping m && m.entries().get("id") != null
                    && m.entries().get("id").value() instanceof YamlNode.Scalar s ? s.text() : "#" + (i + 1);
            out.add(new MappingReader(n, kind + " " + id, problems));
        }
        return out;
    }

    /**
     * The mapping under {@code key}, read by its own reader named {@code name}; an absent key gives an
     * empty mapping, so every key of it falls back to its default.
     */
    public MappingReader mapping(String key, String name) {
        known.add(key);
        YamlNode.Entry e = mapping.entries().get(key);
        return new MappingReader(e == null ? new YamlNode.Mapping(mapping.location(), Map.of()) : e.value(), name,
                problems);
    }

    /** @return the value of {@code key} as it is (a mapping with keys of the file's own choosing), if present */
    public Optional<YamlNode> node(String key) {
        known.add(key);
        YamlNode.Entry e = mapping.entries().get(key);
        return e == null ? Optional.empty() : Optional.of(e.value());
    }

    /**
     * For a key renamed in the format: both spellings are allowed, writing both is a problem.
     * {@link OldKeys} tells the user about the old one.
     *
     * @return the spelling written, or {@code newKey} when neither is
     */
    public String renamedKey(String oldKey, String newKey) {
        known.add(newKey);
        known.add(oldKey);
        boolean oldWritten = mapping.entries().containsKey(oldKey);
        if (oldWritten && mapping.entries().containsKey(newKey)) {
            fail(oldKey, "is the old spelling of " + newKey + "; write only " + newKey);
        }
        return oldWritten && !mapping.entries().containsKey(newKey) ? oldKey : newKey;
    }

    /** Reports every key that was not asked for or allowed, with the closest known key as a hint. */
    public void finish() {
        for (Map.Entry<String, YamlNode.Entry> e : mapping.entries().entrySet()) {
            if (!known.contains(e.getKey())) {
                problems.add(e.getValue().keyLocation() + ": unknown key '" + e.getKey() + "' in " + what
                        + KeyHints.didYouMean(e.getKey(), known) + "; allowed here: " + known);
            }
        }
    }

    /** Records a problem with the value of {@code key} (at the key's line) and marks the key as failed. */
    public void fail(String key, String message) {
        failedKeys.add(key);
        problems.add(locationOf(key) + ": " + key + " of " + what + " " + message);
    }

    /** Records a problem with this mapping as a whole, at its own location. */
    public void fail(String message) {
        problems.add(location() + ": " + what + " " + message);
    }

    /** Records that {@code key} is missing (at the mapping's location) and marks it as failed. */
    public void missing(String key) {
        known.add(key);
        failedKeys.add(key);
        problems.add(mapping.location() + ": " + what + " is missing '" + key + "'");
    }

    /** Marks keys as allowed without reading them (when their meaning depends on a value that was refused). */
    public void allow(String... keys) {
        known.addAll(List.of(keys));
    }

    /** Marks keys as allowed without reading them. */
    public void allow(Collection<String> keys) {
        known.addAll(keys);
    }

    /** @return true when the key was missing or of the wrong type (already reported) */
    public boolean failed(String key) {
        return failedKeys.contains(key);
    }

    public String what() {
        return what;
    }

    /** @return where this mapping and its keys are, and which keys were refused so far, for checks made later */
    public KeyLocations locations() {
        Map<String, SourceLocation> keys = new java.util.LinkedHashMap<>();
        mapping.entries().forEach((k, e) -> keys.put(k, e.keyLocation()));
        return new KeyLocations(what, mapping.location(), keys, failedKeys);
    }

    /** @return the candidate a mistyped {@code key} most likely meant, or null when none is close */
    public static String closest(String key, Collection<String> candidates) {
        return KeyHints.closest(key, candidates);
    }

    private double inRange(String key, double v, Range range, double fallback) {
        if (range.contains(v)) {
            return v;
        }
        fail(key, "= " + Range.format(v) + " is outside " + range);
        return fallback;
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
        fail(key, "must be a single value, not a list or mapping");
        return null;
    }

    private void fail(YamlNode.Scalar at, String key, String message) {
        failedKeys.add(key);
        problems.add(at.location() + ": " + key + " of " + what + " " + message);
    }

    private static boolean isNumber(YamlNode.Scalar s) {
        return s.token() == JsonToken.VALUE_NUMBER_INT || s.token() == JsonToken.VALUE_NUMBER_FLOAT;
    }

    private static String orList(String... words) {
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < words.length; i++) {
            b.append(i == 0 ? "" : i == words.length - 1 ? " or " : ", ").append(words[i]);
        }
        return b.toString();
    }
}
