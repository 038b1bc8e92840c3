package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.CompletableFuture;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.MessageArbitraries;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitTelemetry;

class RecentEncodingsTest {
    private final MessageCodec codec = new MessageCodec();

    private static AreaMeter meter(long seq, String area, double netInterchangeMw) {
        return new AreaMeter(seq, 1_767_225_600_000L, area, "m1", 49.98, Quality.GOOD,
                List.of(new TieFlow("north-south", -120.5, Quality.GOOD)), netInterchangeMw, Quality.GOOD);
    }

    @Test
    void shouldAnswerADecodeOfBytesJustEncodedOnThisThreadWithTheEncodedRecord() {
        AreaMeter sent = meter(1, "north", 250.0);
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            byte[] bytes = codec.encode(sent).clone(); // the in-memory broker hands each subscriber a copy
            Decoded<AreaMeter> got = codec.decode(bytes, AreaMeter.class);
            assertThat(got.message().orElseThrow()).isSameAs(sent);
            assertThat(recent.answered()).isEqualTo(1);
        }
    }

    @Test
    void shouldParseBytesThatDifferFromEveryEncoding() {
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            byte[] bytes = codec.encode(meter(1, "north", 250.0));
            byte[] changed = new String(bytes, StandardCharsets.UTF_8).replace("north\"", "south\"")
                    .getBytes(StandardCharsets.UTF_8); // what a fault stage may do to a payload
            AreaMeter got = codec.decode(changed, AreaMeter.class).message().orElseThrow();
            assertThat(got.area()).isEqualTo("south");
            assertThat(recent.answered()).isZero();
        }
    }

    @Test
    void shouldParseWhenAskedForAnotherTypeOrOverTheReceiversSizeLimit() {
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            byte[] bytes = codec.encode(meter(1, "north", 250.0));
            assertThat(codec.decode(bytes, UnitTelemetry.class).rejection()).isPresent();
            assertThat(new MessageCodec(10).decode(bytes, AreaMeter.class).rejection().orElseThrow().kind())
                    .isEqualTo(DecodeErrorKind.OVERSIZED);
            assertThat(recent.answered()).isZero();
        }
    }

    @Test
    void shouldNotRememberFaultOrdersWhoseParametersAreAMutableMap() {
        FaultOrder order = new FaultOrder(1, 1_767_225_600_000L, "o1", FaultAction.START, "meterFreeze",
                List.of("m1"), Map.of("holdS", 5.0), null);
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            FaultOrder got = codec.decode(codec.encode(order), FaultOrder.class).message().orElseThrow();
            assertThat(got).isEqualTo(order).isNotSameAs(order);
            assertThat(recent.answered()).isZero();
        }
    }

    @Test
    void shouldRememberOnlyTheLastEncodingsOnlyOnItsThreadAndOnlyWhileOpen() throws Exception {
        AreaMeter first = meter(1, "north", 250.0);
        byte[] firstBytes;
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            firstBytes = codec.encode(first);
            AreaMeter onOtherThread = CompletableFuture.supplyAsync(
                    () -> codec.decode(firstBytes, AreaMeter.class).message().orElseThrow()).get();
            assertThat(onOtherThread).isEqualTo(first).isNotSameAs(first);
            for (int i = 0; i < RecentEncodings.KEPT; i++) {
                codec.encode(meter(2 + i, "north", 250.0));
            }
            assertThat(codec.decode(firstBytes, AreaMeter.class).message().orElseThrow()).isNotSameAs(first);
            assertThat(recent.answered()).isZero();
        }
        assertThat(codec.decode(firstBytes, AreaMeter.class).message().orElseThrow()).isEqualTo(first).isNotSameAs(first);
    }

    @Test
    void shouldGiveTheParsedRecordForDoublesOfFullPrecision() {
        // Readings carry physics results with all 17 digits; the arbitraries below use fewer.
        Random random = new Random(20261203L);
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            for (int i = 0; i < 2_000; i++) {
                double mw = (random.nextDouble() - 0.5) * 2e6 * Math.pow(10, -random.nextInt(12));
                AreaMeter sent = meter(i, "north", mw);
                byte[] bytes = codec.encode(sent);
                assertThat(parsedAfresh(bytes, AreaMeter.class)).isEqualTo(sent);
                assertThat(codec.decode(bytes, AreaMeter.class).message().orElseThrow()).isSameAs(sent);
            }
            assertThat(recent.answered()).isEqualTo(2_000);
        }
    }

    @Property(tries = 300)
    void shouldAnswerAsParsingWouldForEveryMessageType(@ForAll("messages") Object message) {
        try (RecentEncodings recent = RecentEncodings.openOnThisThread()) {
            byte[] bytes = codec.encode(message);
            Decoded<?> remembered = codec.decode(bytes, message.getClass());
            assertThat(remembered).isEqualTo(new Decoded.Ok<>(parsedAfresh(bytes, message.getClass())));
            assertThat(recent.answered()).isEqualTo(message instanceof FaultOrder ? 0 : 1);
        }
    }

    @Provide
    Arbitrary<Object> messages() {
        return MessageArbitraries.anyMessage();
    }

    /** Decodes on a thread with no recent encodings: the JSON is parsed and checked. */
    private <T> T parsedAfresh(byte[] bytes, Class<T> type) {
        return CompletableFuture.supplyAsync(() -> codec.decode(bytes, type).message().orElseThrow()).join();
    }
}
