package org.loopstand.plant.profile;

import java.io.IOException;
import java.io.Reader;
import java.lang.reflect.ParameterizedType;
import java.lang.reflect.RecordComponent;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;
import org.loopstand.protocol.topic.TopicKind;

/**
 * Reads a wire profile file (YAML; keys in docs/controller-contract.md, "Wire profiles"). Every problem
 * is reported at once as {@code file:line:column: what is wrong}: an unknown message or field (with
 * the closest name), a topic template without an id the kind needs or with an id it has not, two kinds
 * on one topic, a scale that is 0 or not finite, a timestamp form on a field that is not a time, two
 * fields with one wire name.
 */
public final class WireProfileLoader {
    /** The kinds a controller sees; the plant's internal field topics and the fault orders keep their layout. */
    static final Set<TopicKind> CONTROLLER_SIDE = EnumSet.of(TopicKind.AREA_METER, TopicKind.UNIT_TELEMETRY,
            TopicKind.UNIT_COMMAND, TopicKind.UNIT_ACK, TopicKind.UNIT_LINK, TopicKind.AREA_SCHEDULE,
            TopicKind.CONTROLLER_STATUS, TopicKind.CLOCK, TopicKind.RUN);
    private static final Pattern PLACEHOLDER = Pattern.compile("\\{([A-Za-z]*)}");
    private static final Pattern WIRE_NAME = Pattern.compile("[A-Za-z_][A-Za-z0-9_]{0,63}");

    private final List<String> problems = new ArrayList<>();

    private WireProfileLoader() {
    }

    /**
     * @param site the site id the profile's topics are built for
     * @throws ConfigFileException with every problem found
     */
    public static WireProfile load(Path file, String site) throws IOException {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return load(file.toString(), r, site);
        }
    }

    /** @param fileName used in messages only */
    public static WireProfile load(String fileName, Reader reader, String site) throws IOException {
        return new WireProfileLoader().read(YamlNode.read(fileName, reader), site);
    }

    private WireProfile read(YamlNode root, String site) {
        MappingReader top = new MappingReader(root, "the wire profile", problems);
        String name = top.requiredString("profile");
        Map<TopicKind, MessageMapping> mappings = new EnumMap<>(TopicKind.class);
        YamlNode messages = top.node("messages").orElse(null);
        top.finish();
        if (messages == null) {
            problems.add(top.location() + ": the wire profile is missing 'messages'");
        } else if (!(messages instanceof YamlNode.Mapping m)) {
            problems.add(messages.location() + ": messages must be a mapping of message name: its layout");
        } else {
            Map<String, TopicKind> byName = new LinkedHashMap<>();
            CONTROLLER_SIDE.forEach(k -> byName.put(k.messageType().getSimpleName(), k));
            Map<String, String> templates = new HashMap<>();
            m.entries().forEach((msg, entry) -> {
                TopicKind kind = byName.get(msg);
                if (kind == null) {
                    String hint = MappingReader.closest(msg, byName.keySet());
                    problems.add(entry.keyLocation() + ": unknown message '" + msg + "'" + (hint == null ? "" : " (did you mean '"
                            + hint + "'?)") + "; a profile can change " + byName.keySet());
                    return;
                }
                MessageMapping mm = message(kind, entry.value(), msg, templates);
                if (mm != null) {
                    mappings.put(kind, mm);
                }
            });
        }
        if (!problems.isEmpty()) {
            throw new ConfigFileException(problems);
        }
        return new WireProfile(name, site, mappings);
    }

    private MessageMapping message(TopicKind kind, YamlNode node, String msg, Map<String, String> templates) {
        MappingReader r = new MappingReader(node, "message " + msg, problems);
        String template = r.optionalString("topic", org.loopstand.protocol.topic.TopicTree.PREFIX + "/{site}"
                + "/" + String.join("/", kind.levelTemplate()));
        checkTemplate(r, kind, template, templates, msg);
        YamlNode fieldsNode = r.node("fields").orElse(null);
        r.finish();
        Map<String, FieldMapping> fields = new LinkedHashMap<>();
        Map<String, Map<String, FieldMapping>> elements = new LinkedHashMap<>();
        if (fieldsNode instanceof YamlNode.Mapping fm) {
            Map<String, Class<?>> components = components(kind.messageType());
            fm.entries().forEach((key, e) -> field(kind, msg, key, e, components, fields, elements));
            checkUniqueWireNames(msg, fm, components.keySet(), fields);
            elements.forEach((array, em) -> checkUniqueWireNames(msg + " " + array + "[]", fm,
                    components(elementType(kind.messageType(), array)).keySet(), em));
        } else if (fieldsNode != null) {
            problems.add(fieldsNode.location() + ": fields of message " + msg + " must be a mapping of field: {name, scale, negate, time}");
        }
        return new MessageMapping(kind, template, fields, elements);
    }

    private void checkTemplate(MappingReader r, TopicKind kind, String template, Map<String, String> templates, String msg) {
        if (template.isEmpty() || template.contains("+") || template.contains("#") || template.startsWith("/")
                || template.endsWith("/") || template.contains("//")) {
            r.fail("topic", "must be a topic without wildcards or empty levels, got '" + template + "'");
            return;
        }
        Matcher ph = PLACEHOLDER.matcher(template);
        List<String> seen = new ArrayList<>();
        while (ph.find()) {
            String id = ph.group(1);
            if (!id.equals("site") && !kind.idNames().contains(id)) {
                r.fail("topic", "has the placeholder {" + id + "}, which " + msg + " has not; it can use {site}"
                        + kind.idNames().stream().map(n -> ", {" + n + "}").reduce("", String::concat));
            } else if (seen.contains(id)) {
                r.fail("topic", "has {" + id + "} twice");
            }
            seen.add(id);
        }
        for (String id : kind.idNames()) {
            if (!seen.contains(id)) {
                r.fail("topic", "lacks {" + id + "}: every " + msg + " topic must name its " + id);
            }
        }
        String shape = PLACEHOLDER.matcher(template).replaceAll("+");
        String other = templates.putIfAbsent(shape, msg);
        if (other != null) {
            r.fail("topic", "has the same shape as the topic of " + other + " ('" + shape + "'): a message could not be told apart");
        }
    }

    private void field(TopicKind kind, String msg, String key, YamlNode.Entry e, Map<String, Class<?>> components,
                       Map<String, FieldMapping> fields, Map<String, Map<String, FieldMapping>> elements) {
        String array = null;
        String rigField = key;
        Map<String, Class<?>> where = components;
        int brackets = key.indexOf("[].");
        if (brackets > 0) {
            array = key.substring(0, brackets);
            rigField = key.substring(brackets + 3);
            Class<?> element = components.containsKey(array) ? elementType(kind.messageType(), array) : null;
            if (element == null) {
                problems.add(e.keyLocation() + ": '" + array + "' in " + msg + " is not a list of objects");
                return;
            }
            where = components(element);
        }
        if (!where.containsKey(rigField)) {
            String hint = MappingReader.closest(rigField, where.keySet());
            problems.add(e.keyLocation() + ": " + msg + " has no field '" + key + "'" + (hint == null ? "" : " (did you mean '"
                    + hint + "'?)") + "; its fields: " + where.keySet());
            return;
        }
        MappingReader r = new MappingReader(e.value(), "field " + key + " of " + msg, problems);
        String wire = r.optionalString("name", rigField);
        if (!WIRE_NAME.matcher(wire).matches()) {
            r.fail("name", "must be letters, digits and _ (not starting with a digit), 1 to 64 characters, got '" + wire + "'");
        }
        double scale = r.optionalDouble("scale", 1.0);
        if (!Double.isFinite(scale) || scale == 0) {
            r.fail("scale", "must be a finite number other than 0 (wire = rig × scale), got " + scale);
        }
        boolean negate = r.optionalBoolean("negate", false);
        String time = r.optionalString("time", "epochMs");
        FieldMapping.TimeForm form = switch (time) {
            case "epochMs" -> FieldMapping.TimeForm.EPOCH_MS;
            case "iso8601" -> FieldMapping.TimeForm.ISO_8601;
            default -> {
                r.fail("time", "must be epochMs or iso8601, got '" + time + "'");
                yield FieldMapping.TimeForm.EPOCH_MS;
            }
        };
        Class<?> type = where.get(rigField);
        boolean number = type == double.class || type == long.class || type == Double.class || type == Long.class;
        if (form == FieldMapping.TimeForm.ISO_8601 && type != long.class) {
            r.fail("time", "iso8601 is for timestamps (whole epoch ms), and " + rigField + " is not one");
        }
        if ((scale != 1.0 || negate) && !number) {
            r.fail(scale != 1.0 ? "scale" : "negate", "applies to numbers only, and " + rigField + " is not a number");
        }
        r.finish();
        FieldMapping fm = new FieldMapping(rigField, wire, scale, negate, form);
        if (array == null) {
            fields.put(rigField, fm);
        } else {
            elements.computeIfAbsent(array, a -> new LinkedHashMap<>()).put(rigField, fm);
        }
    }

    /** Two fields of one object may not end up with one name on the wire. */
    private void checkUniqueWireNames(String msg, YamlNode.Mapping at, Set<String> rigFields, Map<String, FieldMapping> mapped) {
        Set<String> names = new HashSet<>();
        for (String f : rigFields) {
            String wire = mapped.containsKey(f) ? mapped.get(f).wireName() : f;
            if (!names.add(wire)) {
                problems.add(at.location() + ": in " + msg + " two fields would be called '" + wire + "' on the wire");
            }
        }
    }

    private static Map<String, Class<?>> components(Class<?> record) {
        Map<String, Class<?>> out = new LinkedHashMap<>();
        if (record != null && record.isRecord()) {
            for (RecordComponent c : record.getRecordComponents()) {
                out.put(c.getName(), c.getType());
            }
        }
        return out;
    }

    /** @return the record type of a list component's elements, or null */
    private static Class<?> elementType(Class<?> record, String listField) {
        for (RecordComponent c : record.getRecordComponents()) {
            if (c.getName().equals(listField) && c.getGenericType() instanceof ParameterizedType p
                    && p.getActualTypeArguments()[0] instanceof Class<?> e && e.isRecord()) {
                return e;
            }
        }
        return null;
    }
}
