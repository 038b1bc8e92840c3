package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.ControlMode;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.FieldReading;
import org.loopstand.protocol.message.FieldReference;
import org.loopstand.protocol.message.LinkState;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.Schedule;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;

/** Every way a payload is refused, checked for the kind of error and the JSON path it names. */
class MessageCodecRejectionTest {
    private static final long T0 = 1_767_225_600_000L;
    private static final ObjectMapper TREE = new ObjectMapper();
    private static final MessageCodec CODEC = new MessageCodec();

    static final AreaMeter METER = new AreaMeter(1, T0, "north", "m1", 50.0,
            Quality.of(Validity.QUESTIONABLE, QualityFlag.OLD_DATA),
            List.of(new TieFlow("t1", 10.0, Quality.GOOD), new TieFlow("t2", -5.0, Quality.GOOD)), 5.0, Quality.GOOD);
    static final UnitTelemetry TELEMETRY = new UnitTelemetry(1, T0, "u1", 100.0, Quality.GOOD, 100.0,
            UnitStatus.ONLINE, ControlMode.REMOTE, 50.0, 150.0, 10.0, 5.0, true, 0);
    static final UnitCommand PULSE = UnitCommand.pulse(1, T0, "u1", "ctl", 1, T0 + 8000, PulseDirection.RAISE, 2000);
    static final UnitCommand SETPOINT = UnitCommand.setpoint(2, T0, "u1", "ctl", 1, T0 + 8000, 120.0);
    static final CommandAck ACK = new CommandAck(1, T0, "u1", 1, "ctl", AckOutcome.ACCEPTED, null, null);
    static final LinkStatus LINK = new LinkStatus(1, T0, "plant-u1", LinkState.ONLINE);
    static final Schedule SCHEDULE = new Schedule(1, T0, "north", 100.0, 50.0, T0);
    static final ControllerStatus STATUS = new ControllerStatus(1, T0, "ctl", 1, ControllerState.REGULATING,
            List.of(), 10, List.of(new AreaAce("north", 1.0, 0.5, "normal")));
    static final ClockTick CLOCK = new ClockTick(1, T0, 0, 1.0, true);
    static final FaultOrder FAULT = new FaultOrder(1, T0, "f1", FaultAction.START, "meterFreeze", List.of("m1"),
            Map.of("holdS", 30), 60.0);
    static final FieldReference REFERENCE = new FieldReference(1, T0, "u1", 100.0, true);
    static final FieldReading READING = new FieldReading(1, T0, "u1", 99.5, 100.0, UnitStatus.ONLINE);

    private static ObjectNode tree(Object message) {
        try {
            return (ObjectNode) TREE.readTree(CODEC.encode(message));
        } catch (java.io.IOException e) {
            throw new IllegalStateException(e);
        }
    }

    private static String mutated(Object message, Consumer<ObjectNode> change) {
        ObjectNode node = tree(message);
        change.accept(node);
        return node.toString();
    }

    private static Arguments rule(Object base, String field, Object badValue, DecodeErrorKind kind) {
        String json = mutated(base, node -> set(node, field, badValue));
        return Arguments.of(base.getClass().getSimpleName() + " " + field + "=" + badValue, base.getClass(), json,
                kind, field);
    }

    /** Sets a value at a simple path like {@code ties[1].flowMw}. */
    private static void set(ObjectNode root, String path, Object value) {
        JsonNode node = root;
        String[] parts = path.split("\\.");
        for (int i = 0; i < parts.length - 1; i++) {
            node = step(node, parts[i]);
        }
        String last = parts[parts.length - 1];
        JsonNode valueNode = TREE.valueToTree(value);
        if (last.endsWith("]")) {
            int open = last.indexOf('[');
            ((com.fasterxml.jackson.databind.node.ArrayNode) node.get(last.substring(0, open)))
                    .set(Integer.parseInt(last.substring(open + 1, last.length() - 1)), valueNode);
        } else {
            ((ObjectNode) node).set(last, valueNode);
        }
    }

    private static JsonNode step(JsonNode node, String part) {
        int open = part.indexOf('[');
        if (open < 0) {
            return node.get(part);
        }
        return node.get(part.substring(0, open)).get(Integer.parseInt(part.substring(open + 1, part.length() - 1)));
    }

    static Stream<Arguments> rangeRules() {
        return Stream.of(
                // Common header
                rule(METER, "seq", -1, DecodeErrorKind.OUT_OF_RANGE),
                rule(METER, "sourceTime", 0, DecodeErrorKind.OUT_OF_RANGE),
                // AreaMeter
                rule(METER, "area", "no/slash", DecodeErrorKind.INVALID_VALUE),
                rule(METER, "meter", "", DecodeErrorKind.INVALID_VALUE),
                rule(METER, "frequencyHz", 39.999, DecodeErrorKind.OUT_OF_RANGE),
                rule(METER, "frequencyHz", 70.001, DecodeErrorKind.OUT_OF_RANGE),
                rule(METER, "ties[1].flowMw", 1.000001e6, DecodeErrorKind.OUT_OF_RANGE),
                rule(METER, "ties[1].flowMw", new java.math.BigDecimal("1e400"), DecodeErrorKind.NOT_FINITE),
                rule(METER, "ties[1].tie", "t1", DecodeErrorKind.INVALID_VALUE),
                rule(METER, "netInterchangeMw", -2e6, DecodeErrorKind.OUT_OF_RANGE),
                rule(METER, "frequencyQuality.validity", "bad", DecodeErrorKind.INVALID_VALUE),
                rule(METER, "frequencyQuality.flags[0]", "stale", DecodeErrorKind.INVALID_VALUE),
                // UnitTelemetry
                rule(TELEMETRY, "unit", "-lead", DecodeErrorKind.INVALID_VALUE),
                rule(TELEMETRY, "outputMw", 2e6, DecodeErrorKind.OUT_OF_RANGE),
                rule(TELEMETRY, "setpointMw", -2e6, DecodeErrorKind.OUT_OF_RANGE),
                rule(TELEMETRY, "regulatingMinMw", 151.0, DecodeErrorKind.INVALID_VALUE),
                rule(TELEMETRY, "rampMwPerMin", -0.1, DecodeErrorKind.OUT_OF_RANGE),
                rule(TELEMETRY, "pulseRateMwPerMin", -0.1, DecodeErrorKind.OUT_OF_RANGE),
                rule(TELEMETRY, "lastCommandSeq", -1, DecodeErrorKind.OUT_OF_RANGE),
                rule(TELEMETRY, "status", "running", DecodeErrorKind.INVALID_VALUE),
                rule(TELEMETRY, "controlMode", "REMOTE", DecodeErrorKind.INVALID_VALUE),
                // UnitCommand
                rule(PULSE, "controllerId", "ctl 1", DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "epoch", -1, DecodeErrorKind.OUT_OF_RANGE),
                rule(PULSE, "issuedAt", 0, DecodeErrorKind.OUT_OF_RANGE),
                rule(PULSE, "validUntil", T0, DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "durationMs", 0, DecodeErrorKind.OUT_OF_RANGE),
                rule(PULSE, "durationMs", 600_001, DecodeErrorKind.OUT_OF_RANGE),
                rule(PULSE, "setpointMw", 10.0, DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "direction", "up", DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "keyId", "key/1", DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "signature", "not base64!", DecodeErrorKind.INVALID_VALUE),
                rule(PULSE, "kind", "nudge", DecodeErrorKind.INVALID_VALUE),
                rule(SETPOINT, "durationMs", 1, DecodeErrorKind.OUT_OF_RANGE),
                rule(SETPOINT, "direction", "raise", DecodeErrorKind.INVALID_VALUE),
                rule(SETPOINT, "setpointMw", 1.5e6, DecodeErrorKind.OUT_OF_RANGE),
                // CommandAck
                rule(ACK, "commandSeq", -1, DecodeErrorKind.OUT_OF_RANGE),
                rule(ACK, "reason", "expired", DecodeErrorKind.INVALID_VALUE),
                rule(ACK, "detail", "", DecodeErrorKind.INVALID_VALUE),
                rule(ACK, "detail", "x".repeat(1025), DecodeErrorKind.INVALID_VALUE),
                // LinkStatus
                rule(LINK, "clientId", "", DecodeErrorKind.INVALID_VALUE),
                rule(LINK, "state", "up", DecodeErrorKind.INVALID_VALUE),
                // Schedule
                rule(SCHEDULE, "scheduledFrequencyHz", 75.0, DecodeErrorKind.OUT_OF_RANGE),
                rule(SCHEDULE, "scheduledNetInterchangeMw", 1e7, DecodeErrorKind.OUT_OF_RANGE),
                rule(SCHEDULE, "effectiveFrom", -1, DecodeErrorKind.OUT_OF_RANGE),
                // ControllerStatus
                rule(STATUS, "cycle", -1, DecodeErrorKind.OUT_OF_RANGE),
                rule(STATUS, "areas[0].aceMw", 3e6, DecodeErrorKind.OUT_OF_RANGE),
                rule(STATUS, "areas[0].band", "two words", DecodeErrorKind.INVALID_VALUE),
                rule(STATUS, "state", "Regulating", DecodeErrorKind.INVALID_VALUE),
                // ClockTick
                rule(CLOCK, "rate", 0.0, DecodeErrorKind.OUT_OF_RANGE),
                rule(CLOCK, "rate", 1000.5, DecodeErrorKind.OUT_OF_RANGE),
                rule(CLOCK, "scenarioTimeMs", -1, DecodeErrorKind.OUT_OF_RANGE),
                // FaultOrder
                rule(FAULT, "orderId", "a.b", DecodeErrorKind.INVALID_VALUE),
                rule(FAULT, "targets[0]", "bad id", DecodeErrorKind.INVALID_VALUE),
                rule(FAULT, "durationS", 0.0, DecodeErrorKind.OUT_OF_RANGE),
                rule(FAULT, "action", "pause", DecodeErrorKind.INVALID_VALUE),
                // FieldReference / FieldReading
                rule(REFERENCE, "loadReferenceMw", 1e9, DecodeErrorKind.OUT_OF_RANGE),
                rule(READING, "outputMw", -1e9, DecodeErrorKind.OUT_OF_RANGE),
                rule(READING, "status", "", DecodeErrorKind.INVALID_VALUE));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("rangeRules")
    void shouldRejectEachBrokenRuleNamingTheField(String name, Class<?> type, String json, DecodeErrorKind kind,
            String field) {
        assertRejected(json, type, kind, field);
    }

    static Stream<Arguments> structuralCases() {
        String meter = tree(METER).toString();
        String pulse = tree(PULSE).toString();
        return Stream.of(
                Arguments.of("malformed", AreaMeter.class, meter.replace("\"area\":", "\"area\"="), DecodeErrorKind.MALFORMED, "area"),
                Arguments.of("truncated", AreaMeter.class, meter.substring(0, meter.length() / 2), DecodeErrorKind.MALFORMED, null),
                Arguments.of("not an object", AreaMeter.class, "[1,2]", DecodeErrorKind.WRONG_TYPE, "$"),
                Arguments.of("json null", AreaMeter.class, "null", DecodeErrorKind.WRONG_TYPE, "$"),
                Arguments.of("trailing content", AreaMeter.class, meter + "{}", DecodeErrorKind.MALFORMED, "$"),
                Arguments.of("missing required field", AreaMeter.class, mutated(METER, n -> n.remove("frequencyHz")),
                        DecodeErrorKind.MISSING_FIELD, "frequencyHz"),
                Arguments.of("missing nested field", AreaMeter.class, mutated(METER, n -> ((ObjectNode) n.get("ties").get(1))
                        .remove("quality")), DecodeErrorKind.MISSING_FIELD, "ties[1].quality"),
                Arguments.of("missing quality flags", AreaMeter.class, mutated(METER, n -> n.withObjectProperty("frequencyQuality")
                        .remove("flags")), DecodeErrorKind.MISSING_FIELD, "frequencyQuality.flags"),
                Arguments.of("missing primitive boolean", UnitTelemetry.class, mutated(TELEMETRY, n -> n.remove("acceptsSetpoints")),
                        DecodeErrorKind.MISSING_FIELD, "acceptsSetpoints"),
                Arguments.of("null for primitive", AreaMeter.class, mutated(METER, n -> n.putNull("seq")), DecodeErrorKind.WRONG_TYPE,
                        "seq"),
                Arguments.of("null for required object", AreaMeter.class, mutated(METER, n -> n.putNull("frequencyQuality")),
                        DecodeErrorKind.WRONG_TYPE, "frequencyQuality"),
                Arguments.of("null list element", AreaMeter.class, mutated(METER, n -> n.withArray("ties").addNull()),
                        DecodeErrorKind.WRONG_TYPE, "ties[2]"),
                Arguments.of("string for number", AreaMeter.class, mutated(METER, n -> n.put("frequencyHz", "50.0")),
                        DecodeErrorKind.WRONG_TYPE, "frequencyHz"),
                Arguments.of("string for long", AreaMeter.class, mutated(METER, n -> n.put("seq", "1")), DecodeErrorKind.WRONG_TYPE,
                        "seq"),
                Arguments.of("fraction for long", AreaMeter.class, mutated(METER, n -> n.put("seq", 1.5)), DecodeErrorKind.WRONG_TYPE,
                        "seq"),
                Arguments.of("number for string", AreaMeter.class, mutated(METER, n -> n.put("area", 7)), DecodeErrorKind.WRONG_TYPE,
                        "area"),
                Arguments.of("number for boolean", UnitTelemetry.class, mutated(TELEMETRY, n -> n.put("acceptsSetpoints", 1)),
                        DecodeErrorKind.WRONG_TYPE, "acceptsSetpoints"),
                Arguments.of("string for boolean", UnitTelemetry.class, mutated(TELEMETRY, n -> n.put("acceptsSetpoints", "true")),
                        DecodeErrorKind.WRONG_TYPE, "acceptsSetpoints"),
                Arguments.of("number for enum", UnitCommand.class, mutated(PULSE, n -> n.put("direction", 0)),
                        DecodeErrorKind.WRONG_TYPE, "direction"),
                Arguments.of("object for number", AreaMeter.class, mutated(METER, n -> n.putObject("frequencyHz")),
                        DecodeErrorKind.WRONG_TYPE, "frequencyHz"),
                Arguments.of("single value for list", FaultOrder.class, mutated(FAULT, n -> n.put("targets", "m1")),
                        DecodeErrorKind.WRONG_TYPE, "targets"),
                Arguments.of("NaN literal", AreaMeter.class, meter.replace("\"frequencyHz\":50.0", "\"frequencyHz\":NaN"),
                        DecodeErrorKind.NOT_FINITE, "frequencyHz"),
                Arguments.of("Infinity literal in list", AreaMeter.class, meter.replace("\"flowMw\":-5.0", "\"flowMw\":-Infinity"),
                        DecodeErrorKind.NOT_FINITE, "ties[1].flowMw"),
                Arguments.of("too large for long", AreaMeter.class, mutated(METER, n -> n.put("seq", new java.math.BigInteger(
                        "99999999999999999999"))), DecodeErrorKind.OUT_OF_RANGE, "seq"),
                Arguments.of("unknown field", AreaMeter.class, mutated(METER, n -> n.put("frequencyMHz", 1)),
                        DecodeErrorKind.UNKNOWN_FIELD, "frequencyMHz"),
                Arguments.of("unknown nested field", AreaMeter.class, mutated(METER, n -> ((ObjectNode) n.get("ties").get(1))
                        .put("lossMw", 1)), DecodeErrorKind.UNKNOWN_FIELD, "ties[1].lossMw"),
                Arguments.of("duplicate key", AreaMeter.class, meter.replace("\"meter\":\"m1\"", "\"meter\":\"m1\",\"meter\":\"m2\""),
                        DecodeErrorKind.MALFORMED, "meter"),
                Arguments.of("duplicate quality flag", AreaMeter.class, mutated(METER, n -> n.withObjectProperty("frequencyQuality")
                        .putArray("flags").add("oldData").add("oldData")), DecodeErrorKind.INVALID_VALUE,
                        "frequencyQuality"),
                Arguments.of("rejection without reason", CommandAck.class,
                        mutated(ACK, n -> n.put("outcome", "rejected")), DecodeErrorKind.MISSING_FIELD, "reason"),
                Arguments.of("pulse without direction", UnitCommand.class, pulse.replace(",\"direction\":\"raise\"", ""),
                        DecodeErrorKind.MISSING_FIELD, "direction"),
                Arguments.of("null in fault parameters", FaultOrder.class, mutated(FAULT, n -> n.withObjectProperty("parameters").putNull("x")),
                        DecodeErrorKind.WRONG_TYPE, "parameters.x"),
                Arguments.of("nested null in fault parameters", FaultOrder.class, mutated(FAULT, n -> n.withObjectProperty("parameters")
                        .putArray("list").add(1).addNull()), DecodeErrorKind.WRONG_TYPE, "parameters.list[1]"),
                Arguments.of("nesting too deep", FaultOrder.class, mutated(FAULT, n -> n.withObjectProperty("parameters").put("deep", 0))
                        .replace("\"deep\":0", "\"deep\":" + "[".repeat(40) + "]".repeat(40)),
                        DecodeErrorKind.MALFORMED, null));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("structuralCases")
    void shouldRejectStructuralProblemsNamingTheField(String name, Class<?> type, String json, DecodeErrorKind kind,
            String field) {
        assertRejected(json, type, kind, field);
    }

    @Test
    void shouldRejectEmptyPayload() {
        assertRejected("", AreaMeter.class, DecodeErrorKind.MALFORMED, "$");
        assertRejected("   ", AreaMeter.class, DecodeErrorKind.MALFORMED, "$");
        assertThat(CODEC.decode(null, AreaMeter.class).rejection().orElseThrow().kind())
                .isEqualTo(DecodeErrorKind.MALFORMED);
    }

    @Test
    void shouldRejectOversizedPayloadBeforeParsing() {
        byte[] valid = CODEC.encode(METER);
        MessageCodec small = new MessageCodec(valid.length);
        assertThat(small.decode(valid, AreaMeter.class).isOk()).isTrue();
        byte[] oneMore = java.util.Arrays.copyOf(valid, valid.length + 1);
        oneMore[valid.length] = ' ';
        // Proof that the size is checked before parsing: garbage of the same size is also OVERSIZED.
        byte[] garbage = new byte[valid.length + 1];
        for (byte[] payload : List.of(oneMore, garbage)) {
            DecodeError error = small.decode(payload, AreaMeter.class).rejection().orElseThrow();
            assertThat(error.kind()).isEqualTo(DecodeErrorKind.OVERSIZED);
            assertThat(error.field()).isEqualTo("$");
        }
        assertThat(new MessageCodec().maxPayloadBytes()).isEqualTo(65_536);
    }

    @Test
    void shouldRejectTypesThatAreNotMessagesWithoutThrowing() {
        byte[] valid = CODEC.encode(METER);
        assertThat(CODEC.decode(valid, String.class).rejection().orElseThrow().kind())
                .isEqualTo(DecodeErrorKind.INVALID_VALUE);
        assertThat(CODEC.decode(valid, null).isOk()).isFalse();
    }

    @Test
    void shouldRefuseToEncodeInvalidMessagesNamingTheField() {
        AreaMeter nan = new AreaMeter(1, T0, "north", "m1", Double.NaN, Quality.GOOD, List.of(), 0.0, Quality.GOOD);
        assertThatThrownBy(() -> CODEC.encode(nan)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("NOT_FINITE at frequencyHz");
        UnitCommand backwards = new UnitCommand(1, T0, "u1", "ctl", 0, T0, T0 - 1,
                org.loopstand.protocol.message.CommandKind.PULSE, PulseDirection.LOWER, 10, null, null, null);
        assertThatThrownBy(() -> CODEC.encode(backwards)).hasMessageContaining("validUntil");
        assertThatThrownBy(() -> CODEC.encode("text")).hasMessageContaining("not a v1 message type");
    }

    @Test
    void shouldRejectNonFiniteValuesEvenIfTheParserLetThemThrough() {
        // The parser refuses NaN literals; the validator is the second line should that ever change.
        assertThat(MessageCodec.allowsNonNumericNumbers()).isFalse();
        UnitTelemetry infinite = new UnitTelemetry(1, T0, "u1", 1.0, Quality.GOOD, 1.0, UnitStatus.ONLINE,
                ControlMode.REMOTE, 0.0, 1.0, Double.POSITIVE_INFINITY, 1.0, false, 0);
        assertThat(MessageValidator.validate(infinite)).contains(
                new DecodeError(DecodeErrorKind.NOT_FINITE, "rampMwPerMin", "must be a finite number, got Infinity"));
        AreaMeter nanTie = new AreaMeter(1, T0, "a", "m", 50.0, Quality.GOOD,
                List.of(new TieFlow("t", Double.NaN, Quality.of(Validity.GOOD, QualityFlag.TEST))), 0.0, Quality.GOOD);
        assertThat(MessageValidator.validate(nanTie).orElseThrow().field()).isEqualTo("ties[0].flowMw");
    }

    @Test
    void shouldNeverThrowOnArbitraryBytes() {
        java.util.Random random = new java.util.Random(42);
        byte[] valid = CODEC.encode(METER);
        for (int i = 0; i < 2000; i++) {
            byte[] payload = valid.clone();
            for (int flips = 0; flips < 1 + random.nextInt(4); flips++) {
                payload[random.nextInt(payload.length)] = (byte) random.nextInt(256);
            }
            Decoded<AreaMeter> decoded = CODEC.decode(payload, AreaMeter.class);
            if (decoded.isOk()) {
                assertThat(MessageValidator.validate(decoded.message().orElseThrow())).isEmpty();
            } else {
                assertThat(decoded.rejection().orElseThrow().field()).isNotBlank();
            }
        }
    }

    private static void assertRejected(String json, Class<?> type, DecodeErrorKind kind, String field) {
        Decoded<?> decoded = CODEC.decode(json.getBytes(StandardCharsets.UTF_8), type);
        assertThat(decoded.isOk()).as("decoded %s", json).isFalse();
        DecodeError error = decoded.rejection().orElseThrow();
        assertThat(error.kind()).as("kind of %s", error).isEqualTo(kind);
        if (field != null) {
            assertThat(error.field()).as("field of %s", error).isEqualTo(field);
        }
        assertThat(error.detail()).isNotBlank();
    }
}
