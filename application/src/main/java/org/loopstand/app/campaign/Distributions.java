package org.loopstand.app.campaign;

import java.util.ArrayList;
import java.util.List;

import com.fasterxml.jackson.core.JsonToken;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;

/**
 * Reads a {@link Distribution} from a campaign file: a number or text (that one value), a list (one of
 * them), or {@code {min: A, max: B}} (uniform). Empty lists and min above max are refused at their line.
 */
final class Distributions {
    private Distributions() {
    }

    /** @return the distribution of {@code key} (numbers), or null when missing or refused (reported) */
    static Distribution required(MappingReader r, String key, List<String> problems) {
        YamlNode node = r.node(key).orElse(null);
        if (node == null) {
            problems.add(r.location() + ": " + r.what() + " is missing '" + key + "'");
            return null;
        }
        return numbers(node, key + " of " + r.what(), problems);
    }

    /** @return the ids listed under {@code key} (a list of texts, or one text), empty when missing or refused (reported) */
    static List<String> ids(MappingReader r, String key, List<String> problems) {
        YamlNode node = r.node(key).orElse(null);
        if (node == null) {
            problems.add(r.location() + ": " + r.what() + " is missing '" + key + "'");
            return List.of();
        }
        Distribution d = texts(node, key + " of " + r.what(), problems);
        return d instanceof Distribution.OneOf o ? o.textValues() : List.of();
    }

    /** @return a number distribution, or null (reported) */
    static Distribution numbers(YamlNode node, String what, List<String> problems) {
        if (node instanceof YamlNode.Scalar s) {
            if (!isNumber(s)) {
                problems.add(s.location() + ": " + what + " must be a number, a list of numbers or {min, max}, got '" + s.text() + "'");
                return null;
            }
            double v = Double.parseDouble(s.text());
            return new Distribution.Uniform(v, v);
        }
        if (node instanceof YamlNode.Sequence seq) {
            if (seq.items().isEmpty()) {
                problems.add(seq.location() + ": " + what + " is an empty list: nothing to draw from");
                return null;
            }
            List<Double> values = new ArrayList<>();
            for (YamlNode item : seq.items()) {
                if (item instanceof YamlNode.Scalar s && isNumber(s)) {
                    values.add(Double.parseDouble(s.text()));
                } else {
                    problems.add(item.location() + ": " + what + " must hold numbers only");
                    return null;
                }
            }
            return new Distribution.OneOf(values);
        }
        List<String> local = new ArrayList<>();
        MappingReader r = new MappingReader(node, what, local);
        double min = r.requiredDouble("min");
        double max = r.requiredDouble("max");
        r.finish();
        problems.addAll(local);
        if (!local.isEmpty()) {
            return null;
        }
        if (min > max) {
            problems.add(r.locationOf("min") + ": " + what + " is contradictory: min " + Distribution.format(min)
                    + " is above max " + Distribution.format(max));
            return null;
        }
        return new Distribution.Uniform(min, max);
    }

    /** @return a text distribution, or null (reported) */
    static Distribution texts(YamlNode node, String what, List<String> problems) {
        List<YamlNode> items = node instanceof YamlNode.Sequence seq ? seq.items() : List.of(node);
        if (items.isEmpty()) {
            problems.add(node.location() + ": " + what + " is an empty list: nothing to draw from");
            return null;
        }
        List<String> values = new ArrayList<>();
        for (YamlNode item : items) {
            if (item instanceof YamlNode.Scalar s && s.token() == JsonToken.VALUE_STRING && !s.text().isBlank()) {
                values.add(s.text());
            } else {
                problems.add(item.location() + ": " + what + " must be a text or a list of texts");
                return null;
            }
        }
        return new Distribution.OneOf(values);
    }

    private static boolean isNumber(YamlNode.Scalar s) {
        return s.token() == JsonToken.VALUE_NUMBER_INT || s.token() == JsonToken.VALUE_NUMBER_FLOAT;
    }
}
