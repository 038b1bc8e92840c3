package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.networknt.schema.JsonSchema;
import com.networknt.schema.JsonSchemaFactory;
import com.networknt.schema.SchemaLocation;
import com.networknt.schema.SpecVersion;
import com.networknt.schema.ValidationMessage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.RunState;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.MessageArbitraries;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;

/**
 * Wire contract check: every message the codec emits and every example of docs/messages.md
 * validates against its published schema — JSON Schema draft 2020-12, validated with networknt
 * json-schema-validator — and every example decodes with the codec.
 */
class JsonSchemaConformanceTest {
    private static final Path DOCS = Path.of("..", "docs");
    private static final Pattern EXAMPLE = Pattern.compile("<!-- example: ([a-z-]+) -->\\s*```json\\n(.*?)```",
            Pattern.DOTALL);
    private static final ObjectMapper TREE = new ObjectMapper();
    private static final MessageCodec CODEC = new MessageCodec();
    private static final JsonSchemaFactory FACTORY = JsonSchemaFactory.getInstance(SpecVersion.VersionFlag.V202012);

    static final Map<String, Class<?>> TYPES = Map.ofEntries(Map.entry("area-meter", AreaMeter.class),
            Map.entry("unit-telemetry", UnitTelemetry.class), Map.entry("unit-command", UnitCommand.class),
            Map.entry("command-ack", CommandAck.class), Map.entry("link-status", LinkStatus.class),
            Map.entry("schedule", Schedule.class), Map.entry("controller-status", ControllerStatus.class),
            Map.entry("clock-tick", ClockTick.class), Map.entry("run-state", RunState.class), Map.entry("fault-order", FaultOrder.class),
            Map.entry("field-reference", FieldReference.class), Map.entry("field-reading", FieldReading.class));
    private static final Map<Class<?>, JsonSchema> SCHEMAS = TYPES.entrySet().stream()
            .collect(Collectors.toMap(Map.Entry::getValue, e -> loadSchema(e.getKey())));

    private static JsonSchema loadSchema(String name) {
        return FACTORY.getSchema(readTree(DOCS.resolve("schemas").resolve(name + ".schema.json")));
    }

    private static JsonNode readTree(Path path) {
        try {
            return TREE.readTree(Files.readString(path));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static Map<String, String> examples() throws IOException {
        Map<String, String> found = new LinkedHashMap<>();
        Matcher m = EXAMPLE.matcher(Files.readString(DOCS.resolve("messages.md")));
        while (m.find()) {
            assertThat(found.put(m.group(1), m.group(2))).as("second example for %s", m.group(1)).isNull();
        }
        return found;
    }

    @Test
    void shouldPublishOneSchemaPerMessageTypeEachValidAgainstTheMetaSchema() throws IOException {
        assertThat(TYPES.values()).containsExactlyInAnyOrderElementsOf(MessageValidator.MESSAGE_TYPES);
        try (Stream<Path> files = Files.list(DOCS.resolve("schemas"))) {
            assertThat(files.map(p -> p.getFileName().toString()))
                    .containsExactlyInAnyOrderElementsOf(TYPES.keySet().stream().map(n -> n + ".schema.json").toList());
        }
        // The draft 2020-12 meta-schema ships inside the validator jar, so this needs no network.
        JsonSchema meta = FACTORY.getSchema(SchemaLocation.of("https://json-schema.org/draft/2020-12/schema"));
        for (String name : TYPES.keySet()) {
            JsonNode schema = readTree(DOCS.resolve("schemas").resolve(name + ".schema.json"));
            assertThat(meta.validate(schema)).as(name).isEmpty();
            assertThat(schema.get("$id").asText()).isEqualTo("https://loopstand.example/schemas/v1/" + name + ".schema.json");
            assertThat(schema.get("additionalProperties").asBoolean(true)).as(name).isFalse();
        }
    }

    @Test
    void shouldValidateAndDecodeEveryDocumentedExample() throws IOException {
        Map<String, String> examples = examples();
        assertThat(examples.keySet()).containsExactlyInAnyOrderElementsOf(TYPES.keySet());
        for (Map.Entry<String, String> example : examples.entrySet()) {
            Class<?> type = TYPES.get(example.getKey());
            JsonNode node = TREE.readTree(example.getValue());
            assertThat(SCHEMAS.get(type).validate(node)).as(example.getKey()).isEmpty();
            Decoded<?> decoded = CODEC.decode(example.getValue().getBytes(StandardCharsets.UTF_8), type);
            assertThat(decoded.rejection()).as(example.getKey()).isEmpty();
            // Written in canonical form: re-encoding gives the same document.
            assertThat(TREE.readTree(CODEC.encode(decoded.message().orElseThrow()))).as(example.getKey())
                    .isEqualTo(node);
        }
    }

    @Test
    void shouldSendAValidPulseWithTheDocumentedMosquittoCommand() throws IOException {
        String doc = Files.readString(DOCS.resolve("messages.md"));
        Matcher command = Pattern.compile("mosquitto_pub .*? -x (\\d+) \\\\\\n\\s+-t (\\S+) \\\\\\n\\s+-m \"(.*?)\"\\n")
                .matcher(doc);
        assertThat(command.find()).as("mosquitto_pub command in messages.md").isTrue();
        long now = 1_767_225_600_000L;
        // What the shell makes of the -m argument at time `now`.
        String payload = command.group(3).replace("$(($NOW+8000))", Long.toString(now + 8000))
                .replace("$NOW", Long.toString(now)).replace("\\\"", "\"");
        assertThat(command.group(2)).isEqualTo(org.loopstand.protocol.topic.TopicTree.forSite("demo-site")
                .unitCommand("hydro-2"));
        Decoded<UnitCommand> decoded = CODEC.decode(payload.getBytes(StandardCharsets.UTF_8), UnitCommand.class);
        UnitCommand pulse = decoded.message().orElseThrow(() -> new AssertionError(decoded.rejection()));
        assertThat(pulse.validUntil() - pulse.issuedAt()).isEqualTo(Long.parseLong(command.group(1)) * 1000);
        assertThat(SCHEMAS.get(UnitCommand.class).validate(TREE.readTree(payload))).isEmpty();
    }

    @Property(tries = 300)
    void shouldEmitOnlyMessagesThatValidateAgainstTheirSchema(@ForAll("messages") Object message) throws IOException {
        JsonNode encoded = TREE.readTree(CODEC.encode(message));
        Set<ValidationMessage> errors = SCHEMAS.get(message.getClass()).validate(encoded);
        assertThat(errors).as(encoded.toString()).isEmpty();
    }

    @Provide
    Arbitrary<Object> messages() {
        return MessageArbitraries.anyMessage();
    }

    @Test
    void shouldRefuseInSchemaWhatTheCodecRefuses() {
        ObjectNode pulse = tree(MessageCodecRejectionTest.PULSE);
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("setpointMw", 10.0));
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("durationMs", 0));
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("durationMs", 600_001));
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("seq", "1"));
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("direction", "up"));
        assertBothRefuse(UnitCommand.class, pulse.deepCopy().put("unknown", 1));
        assertBothRefuse(UnitCommand.class, (ObjectNode) pulse.deepCopy().without("direction"));
        ObjectNode setpoint = tree(MessageCodecRejectionTest.SETPOINT);
        assertBothRefuse(UnitCommand.class, setpoint.deepCopy().put("direction", "raise"));
        assertBothRefuse(UnitCommand.class, setpoint.deepCopy().put("durationMs", 5));
        assertBothRefuse(CommandAck.class, tree(MessageCodecRejectionTest.ACK).put("outcome", "rejected"));
        assertBothRefuse(CommandAck.class, tree(MessageCodecRejectionTest.ACK).put("reason", "expired"));
        assertBothRefuse(AreaMeter.class, tree(MessageCodecRejectionTest.METER).put("frequencyHz", 70.5));
        assertBothRefuse(AreaMeter.class, tree(MessageCodecRejectionTest.METER).put("area", "a/b"));
        ObjectNode twice = tree(MessageCodecRejectionTest.METER);
        twice.withObjectProperty("frequencyQuality").putArray("flags").add("test").add("test");
        assertBothRefuse(AreaMeter.class, twice);
        assertBothRefuse(ClockTick.class, tree(MessageCodecRejectionTest.CLOCK).put("rate", 0.0));
        assertBothRefuse(FaultOrder.class, tree(MessageCodecRejectionTest.FAULT).put("durationS", 0.0));
        ObjectNode nullParameter = tree(MessageCodecRejectionTest.FAULT);
        nullParameter.withObjectProperty("parameters").putNull("x");
        assertBothRefuse(FaultOrder.class, nullParameter);
        assertBothRefuse(LinkStatus.class, tree(MessageCodecRejectionTest.LINK).put("clientId", "a\u0001b"));
    }

    private static ObjectNode tree(Object message) {
        try {
            return (ObjectNode) TREE.readTree(CODEC.encode(message));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static void assertBothRefuse(Class<?> type, ObjectNode node) {
        assertThat(SCHEMAS.get(type).validate(node)).as("schema on %s", node).isNotEmpty();
        assertThat(CODEC.decode(node.toString().getBytes(StandardCharsets.UTF_8), type).isOk())
                .as("codec on %s", node).isFalse();
    }
}
