package org.loopstand.plant.profile;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.Arbitrary;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.MessageArbitraries;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/** The shipped profile config/profiles/kilo-gateway.yaml, its round trip, and the loader's refusals. */
class WireProfileTest {
    static final Path KILO = Path.of("..", "config", "profiles", "kilo-gateway.yaml");
    static final ObjectMapper JSON = new ObjectMapper();
    final MessageCodec codec = new MessageCodec();
    final TopicTree topics = TopicTree.forSite("demo-site");

    static WireProfile kilo() throws Exception {
        return WireProfileLoader.load(KILO, "demo-site");
    }

    @Test
    void shouldWriteAMeterReadingInKilowattsMillihertzImportSignAndIsoTime() throws Exception {
        AreaMeter m = new AreaMeter(7, 1767225600250L, "north-basin", "main", 49.987, Quality.GOOD,
                List.of(new TieFlow("basin-ridge", 99.8, Quality.GOOD)), 99.8, Quality.GOOD);
        OutboundMessage wire = kilo().toWire(OutboundMessage.of(topics.areaMeter("north-basin", "main"), codec.encode(m),
                Qos.AT_MOST_ONCE));
        assertThat(wire.topic()).isEqualTo("gw/demo-site/zone/north-basin/measurement/main");
        JsonNode n = JSON.readTree(wire.payload());
        assertThat(n.get("freq_mHz").asDouble()).isCloseTo(49_987.0, within(1e-6));
        // export 99.8 MW is an import of −99,800 kW
        assertThat(n.get("import_kW").asDouble()).isCloseTo(-99_800.0, within(1e-6));
        assertThat(n.get("lines").get(0).get("import_kW").asDouble()).isCloseTo(-99_800.0, within(1e-6));
        assertThat(n.get("lines").get(0).get("line").asText()).isEqualTo("basin-ridge");
        assertThat(n.get("stamp").asText()).isEqualTo("2026-01-01T00:00:00.250Z");
        assertThat(n.has("frequencyHz")).isFalse();
    }

    @Test
    void shouldReadACommandWrittenInTheProfileBackIntoTheRigsOwnForm() throws Exception {
        String wire = "{\"n\":12,\"stamp\":\"2026-01-01T00:00:04Z\",\"gen\":\"ridge-hydro-1\",\"agc\":\"gw-agc\",\"epoch\":3,"
                + "\"issued\":\"2026-01-01T00:00:04Z\",\"expires\":\"2026-01-01T00:00:12Z\",\"type\":\"pulse\",\"dir\":\"raise\","
                + "\"duration_s\":2.5}";
        InboundMessage in = new InboundMessage("gw/demo-site/gen/ridge-hydro-1/order", wire.getBytes(StandardCharsets.UTF_8),
                Qos.AT_LEAST_ONCE, false, false, 0);
        List<String> problems = new ArrayList<>();
        InboundMessage rig = kilo().toRig(in, problems);
        assertThat(problems).isEmpty();
        assertThat(rig.topic()).isEqualTo(topics.unitCommand("ridge-hydro-1"));
        UnitCommand c = codec.decode(rig.payload(), UnitCommand.class).message().orElseThrow();
        assertThat(c).isEqualTo(new UnitCommand(12, 1767225604000L, "ridge-hydro-1", "gw-agc", 3, 1767225604000L, 1767225612000L,
                CommandKind.PULSE, PulseDirection.RAISE, 2500, null, null, null));
    }

    @Test
    void shouldNameTheFieldAndTheExpectedFormWhenAProfiledTimeIsNotIso() throws Exception {
        String wire = "{\"n\":12,\"stamp\":1767225604000,\"gen\":\"ridge-hydro-1\"}";
        List<String> problems = new ArrayList<>();
        InboundMessage rig = kilo().toRig(new InboundMessage("gw/demo-site/gen/ridge-hydro-1/order",
                wire.getBytes(StandardCharsets.UTF_8), Qos.AT_LEAST_ONCE, false, false, 0), problems);
        assertThat(problems).containsExactly("field 'stamp' must be an ISO-8601 time such as 2026-01-01T00:00:00.250Z, got 1767225604000");
        // the field keeps its wire name, so the codec refuses the command: the rig's name of that field is missing
        assertThat(codec.decode(rig.payload(), UnitCommand.class).rejection().orElseThrow().toString())
                .isEqualTo("MISSING_FIELD at sourceTime: required field is missing");
    }

    @Test
    void shouldMapSubscriptionFiltersAndLeaveUnmappedTopicsAlone() throws Exception {
        WireProfile p = kilo();
        assertThat(p.toWireFilter(topics.filterAll(TopicKind.CONTROLLER_STATUS))).isEqualTo("gw/demo-site/agc/+/health");
        assertThat(p.toWireFilter(topics.unitCommand("basin-gas-1"))).isEqualTo("gw/demo-site/gen/basin-gas-1/order");
        assertThat(p.toWireFilter(topics.faults())).isEqualTo(topics.faults());
        assertThat(p.toWireFilter(topics.fieldReading("basin-gas-1"))).isEqualTo(topics.fieldReading("basin-gas-1"));
    }

    @Provide
    Arbitrary<Object> controllerSideMessages() {
        return MessageArbitraries.anyMessage().filter(m -> WireProfileLoader.CONTROLLER_SIDE.stream()
                .anyMatch(k -> k.messageType() == m.getClass()));
    }

    /** Rig → profile → rig gives the very message back, for every message kind a controller sees. */
    @Property(tries = 400)
    void shouldGiveEveryMessageBackUnchangedAfterARoundTripThroughTheProfile(@ForAll("controllerSideMessages") Object m)
            throws Exception {
        TopicKind kind = WireProfileLoader.CONTROLLER_SIDE.stream().filter(k -> k.messageType() == m.getClass()).findFirst()
                .orElseThrow();
        String[] ids = kind.idNames().stream().map(n -> "x-" + n).toArray(String[]::new);
        OutboundMessage rig = OutboundMessage.of(topics.topic(kind, ids), codec.encode(m), Qos.AT_LEAST_ONCE);
        WireProfile p = kilo();
        OutboundMessage wire = p.toWire(rig);
        List<String> problems = new ArrayList<>();
        InboundMessage back = p.toRig(new InboundMessage(wire.topic(), wire.payload(), Qos.AT_LEAST_ONCE, false, false, 0), problems);
        assertThat(problems).isEmpty();
        assertThat(back.topic()).isEqualTo(rig.topic());
        Object decoded = codec.decode(back.payload(), m.getClass()).message().orElseThrow(() -> new AssertionError(
                new String(back.payload(), StandardCharsets.UTF_8)));
        assertThat(codec.encode(decoded)).isEqualTo(rig.payload());
    }

    @Test
    void shouldRefuseABadProfileWithEveryProblemAtItsLine() {
        String yaml = """
                profile: broken
                messages:
                  AreaMetre:
                    topic: a/{area}
                  UnitTelemetry:
                    topic: gw/{site}/gen/state
                    fields:
                      outputMW: {name: out_kW, scale: 1000}
                      setpointMw: {name: ref, scale: 0}
                      unit: {name: gen, time: iso8601}
                  UnitCommand:
                    topic: gw/{site}/gen/{unit}/{area}
                    fields:
                      durationMs: {name: duration_s, scale: 0.001}
                      epoch: {name: duration_s}
                  CommandAck:
                    topic: gw/{site}/x/{unit}/y
                  LinkStatus:
                    topic: gw/{site}/x/{unit}/y
                """;
        assertThatThrownBy(() -> WireProfileLoader.load("p.yaml", new StringReader(yaml), "demo-site"))
                .isInstanceOf(ConfigFileException.class)
                .satisfies(e -> assertThat(((ConfigFileException) e).problems()).containsExactlyInAnyOrder(
                        "p.yaml:3:3: unknown message 'AreaMetre' (did you mean 'AreaMeter'?); a profile can change"
                                + " [AreaMeter, UnitTelemetry, UnitCommand, CommandAck, LinkStatus, Schedule, ControllerStatus, ClockTick,"
                                + " RunState]",
                        "p.yaml:6:5: topic of message UnitTelemetry lacks {unit}: every UnitTelemetry topic must name its unit",
                        "p.yaml:8:7: UnitTelemetry has no field 'outputMW' (did you mean 'outputMw'?); its fields: [seq, sourceTime,"
                                + " unit, outputMw, outputQuality, setpointMw, status, controlMode, regulatingMinMw, regulatingMaxMw,"
                                + " rampMwPerMin, pulseRateMwPerMin, acceptsSetpoints, lastCommandSeq]",
                        "p.yaml:9:31: scale of field setpointMw of UnitTelemetry must be a finite number other than 0 (wire = rig ×"
                                + " scale), got 0.0",
                        "p.yaml:10:25: time of field unit of UnitTelemetry iso8601 is for timestamps (whole epoch ms), and unit is not one",
                        "p.yaml:12:5: topic of message UnitCommand has the placeholder {area}, which UnitCommand has not; it can use"
                                + " {site}, {unit}",
                        "p.yaml:14:7: in UnitCommand two fields would be called 'duration_s' on the wire",
                        "p.yaml:19:5: topic of message LinkStatus has the same shape as the topic of CommandAck ('gw/+/x/+/y'): a"
                                + " message could not be told apart"));
    }
}
