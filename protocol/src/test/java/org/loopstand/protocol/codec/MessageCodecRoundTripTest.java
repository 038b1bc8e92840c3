package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.Set;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.MessageArbitraries;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.Validity;

class MessageCodecRoundTripTest {
    private final MessageCodec codec = new MessageCodec();

    @Property(tries = 300)
    void shouldRoundTripEveryMessageType(@ForAll("messages") Object message) {
        byte[] bytes = codec.encode(message);
        Decoded<?> decoded = codec.decode(bytes, message.getClass());
        assertThat(decoded).isEqualTo(new Decoded.Ok<>(message));
        // Deterministic: encoding the decoded copy gives the same bytes (what a signature covers).
        assertThat(codec.encode(decoded.message().orElseThrow())).isEqualTo(bytes);
    }

    @Provide
    Arbitrary<Object> messages() {
        return MessageArbitraries.anyMessage();
    }

    @Test
    void shouldEncodeFieldsInComponentOrderWithEnumWireNames() {
        AreaMeter meter = new AreaMeter(7, 1_767_225_600_000L, "north", "m1", 49.98,
                Quality.of(Validity.QUESTIONABLE, QualityFlag.SUBSTITUTED, QualityFlag.OLD_DATA),
                List.of(new TieFlow("north-south", -120.5, Quality.GOOD)), 250.0, Quality.GOOD);
        String json = new String(codec.encode(meter), StandardCharsets.UTF_8);
        assertThat(json).isEqualTo("{\"seq\":7,\"sourceTime\":1767225600000,\"area\":\"north\",\"meter\":\"m1\","
                + "\"frequencyHz\":49.98,\"frequencyQuality\":{\"validity\":\"questionable\","
                + "\"flags\":[\"oldData\",\"substituted\"]},\"ties\":[{\"tie\":\"north-south\",\"flowMw\":-120.5,"
                + "\"quality\":{\"validity\":\"good\",\"flags\":[]}}],\"netInterchangeMw\":250.0,"
                + "\"netInterchangeQuality\":{\"validity\":\"good\",\"flags\":[]}}");
    }

    @Test
    void shouldOmitAbsentOptionalFieldsAndAcceptExplicitNullForThem() {
        UnitCommand pulse = UnitCommand.pulse(3, 1_767_225_600_000L, "u1", "ctl", 2, 1_767_225_608_000L,
                PulseDirection.RAISE, 1500);
        String json = new String(codec.encode(pulse), StandardCharsets.UTF_8);
        assertThat(json).isEqualTo("{\"seq\":3,\"sourceTime\":1767225600000,\"unit\":\"u1\",\"controllerId\":\"ctl\","
                + "\"epoch\":2,\"issuedAt\":1767225600000,\"validUntil\":1767225608000,\"kind\":\"pulse\","
                + "\"direction\":\"raise\",\"durationMs\":1500}");
        String withNulls = json.replace("}", ",\"setpointMw\":null,\"keyId\":null,\"signature\":null}");
        assertThat(codec.decode(withNulls.getBytes(StandardCharsets.UTF_8), UnitCommand.class))
                .isEqualTo(new Decoded.Ok<>(pulse));
    }

    @Test
    void shouldSortFaultParameterKeysSoThatBytesDoNotDependOnMapOrder() {
        FaultOrder order = new FaultOrder(1, 1_767_225_600_000L, "f1", FaultAction.START, "meterFreeze",
                List.of("m1"), Map.of("zeta", 1, "alpha", List.of(true, "x"), "mid", Map.of("b", 2, "a", 1.5)), null);
        assertThat(new String(codec.encode(order), StandardCharsets.UTF_8)).isEqualTo(
                "{\"seq\":1,\"sourceTime\":1767225600000,\"orderId\":\"f1\",\"action\":\"start\","
                        + "\"faultType\":\"meterFreeze\",\"targets\":[\"m1\"],"
                        + "\"parameters\":{\"alpha\":[true,\"x\"],\"mid\":{\"a\":1.5,\"b\":2},\"zeta\":1}}");
    }

    @Test
    void shouldGiveTheSameResultsWhenSharedAcrossThreads() throws Exception {
        List<Object> messages = MessageArbitraries.anyMessage().sampleStream().limit(400).toList();
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(4);
        try {
            List<java.util.concurrent.Future<Boolean>> results = new java.util.ArrayList<>();
            for (Object message : messages) {
                results.add(pool.submit(() -> codec.decode(codec.encode(message), message.getClass())
                        .equals(new Decoded.Ok<>(message))));
            }
            for (java.util.concurrent.Future<Boolean> result : results) {
                assertThat(result.get(30, java.util.concurrent.TimeUnit.SECONDS)).isTrue();
            }
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void shouldHoldQualityFlagsInDeclarationOrderWhateverTheInputOrder() {
        Quality quality = new Quality(Validity.INVALID, Set.of(QualityFlag.TEST, QualityFlag.OVERFLOW,
                QualityFlag.FAILURE));
        assertThat(quality.flags()).containsExactly(QualityFlag.OVERFLOW, QualityFlag.FAILURE, QualityFlag.TEST);
    }
}
