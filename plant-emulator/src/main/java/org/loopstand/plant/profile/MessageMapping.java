package org.loopstand.plant.profile;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.loopstand.protocol.topic.TopicKind;

/**
 * One message kind on a profiled wire: its topic template and its field mappings. A template is a
 * topic with {@code {site}} and the kind's ids ({@code {area}}, {@code {unit}}, …) as placeholders;
 * field mappings are either top-level ({@code frequencyHz}) or inside the elements of an array
 * ({@code ties[].flowMw}); an array itself can be renamed like any field.
 *
 * @param kind          the rig's topic kind
 * @param topicTemplate the wire topic with placeholders
 * @param fields        top-level field → mapping
 * @param elementFields array field → (element field → mapping)
 */
public record MessageMapping(TopicKind kind, String topicTemplate, Map<String, FieldMapping> fields,
                             Map<String, Map<String, FieldMapping>> elementFields) {
    private static final Pattern PLACEHOLDER = Pattern.compile("\\{([a-z]+)}");

    public MessageMapping {
        fields = Map.copyOf(fields);
        elementFields = Map.copyOf(elementFields);
    }

    /** @return the wire topic for these ids (in {@link TopicKind#idNames()} order), {@code +} allowed as an id */
    String wireTopic(String site, List<String> ids) {
        String t = topicTemplate.replace("{site}", site);
        for (int i = 0; i < kind.idNames().size(); i++) {
            t = t.replace("{" + kind.idNames().get(i) + "}", ids.get(i));
        }
        return t;
    }

    /** @return the ids in {@link TopicKind#idNames()} order when the wire topic fits this template, else null */
    List<String> idsOf(String site, String wireTopic) {
        Matcher names = PLACEHOLDER.matcher(topicTemplate);
        StringBuilder regex = new StringBuilder();
        List<String> order = new ArrayList<>();
        int last = 0;
        while (names.find()) {
            regex.append(Pattern.quote(topicTemplate.substring(last, names.start())));
            if (names.group(1).equals("site")) {
                regex.append(Pattern.quote(site));
            } else {
                regex.append("([^/]+)");
                order.add(names.group(1));
            }
            last = names.end();
        }
        regex.append(Pattern.quote(topicTemplate.substring(last)));
        Matcher m = Pattern.compile(regex.toString()).matcher(wireTopic);
        if (!m.matches()) {
            return null;
        }
        List<String> ids = new ArrayList<>();
        for (String idName : kind.idNames()) {
            ids.add(m.group(order.indexOf(idName) + 1));
        }
        return ids;
    }

    /** Rewrites a rig payload (decoded JSON) into the wire layout, in place. */
    void toWire(ObjectNode rig) {
        List<String> ignored = new ArrayList<>();
        elementFields.forEach((array, mappings) -> eachElement(rig.get(array), e -> rename(e, mappings, true, ignored)));
        rename(rig, fields, true, ignored);
    }

    /**
     * Rewrites a wire payload into the rig layout, in place. A field that cannot be read back keeps its
     * wire name and value (so the codec refuses the message naming it) and adds a line to {@code problems}.
     */
    void toRig(ObjectNode wire, List<String> problems) {
        rename(wire, fields, false, problems);
        elementFields.forEach((array, mappings) -> eachElement(wire.get(array), e -> rename(e, mappings, false, problems)));
    }

    private static void eachElement(JsonNode array, java.util.function.Consumer<ObjectNode> f) {
        if (array instanceof ArrayNode a) {
            for (JsonNode e : a) {
                if (e instanceof ObjectNode o) {
                    f.accept(o);
                }
            }
        }
    }

    /** Renames and converts the mapped fields of one object, keeping the others and the field order. */
    private static void rename(ObjectNode node, Map<String, FieldMapping> mappings, boolean toWire, List<String> problems) {
        if (mappings.isEmpty()) {
            return;
        }
        Map<String, JsonNode> out = new LinkedHashMap<>();
        for (Iterator<Map.Entry<String, JsonNode>> it = node.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            FieldMapping m = toWire ? mappings.get(e.getKey()) : byWireName(mappings, e.getKey());
            if (m == null) {
                out.put(e.getKey(), e.getValue());
            } else if (toWire) {
                out.put(m.wireName(), m.toWire(e.getValue()));
            } else {
                try {
                    out.put(m.rigField(), m.toRig(e.getValue()));
                } catch (IllegalArgumentException x) {
                    problems.add(x.getMessage());
                    out.put(e.getKey(), e.getValue());
                }
            }
        }
        node.removeAll();
        node.setAll(out);
    }

    private static FieldMapping byWireName(Map<String, FieldMapping> mappings, String wireName) {
        for (FieldMapping m : mappings.values()) {
            if (m.wireName().equals(wireName)) {
                return m;
            }
        }
        return null;
    }
}
