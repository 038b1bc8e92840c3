package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.SuspendedArea;

class ControllerStatusSuspendedAreasTest {
    private static final MessageCodec CODEC = new MessageCodec();
    private static final long T0 = 1_767_225_600_000L;

    private static ControllerStatus status(List<SuspendedArea> suspended) {
        return new ControllerStatus(7, T0, "agc-a", 3, ControllerState.REGULATING, List.of(), 7,
                List.of(new AreaAce("north", -12.5, -10.0, "normal")), null, suspended);
    }

    private static SuspendedArea south() {
        return new SuspendedArea("south", List.of("frequencyUnusable:south"), "frequency:south frozen ageMs=1400",
                T0 - 4_000);
    }

    @Test
    void shouldRoundTripTheSuspendedAreasAndOmitThemWhenEveryAreaRegulates() {
        ControllerStatus s = status(List.of(south(), new SuspendedArea("east",
                List.of("tieFlowUnusable:south:east-south"), "tieFlow:south:east-south stale ageMs=12000", T0)));
        assertThat(CODEC.decode(CODEC.encode(s), ControllerStatus.class).message()).contains(s);
        String none = new String(CODEC.encode(status(List.of())), StandardCharsets.UTF_8);
        assertThat(none).doesNotContain("suspendedAreas");
        assertThat(CODEC.decode(none.getBytes(StandardCharsets.UTF_8), ControllerStatus.class).message().orElseThrow()
                .suspendedAreas()).isNull();
    }

    @Test
    void shouldRefuseAnAreaListedTwiceOrSuspendedWithoutAReasonOrTime() {
        assertThat(MessageValidator.validate(status(List.of(south(), south()))).orElseThrow().field())
                .startsWith("suspendedAreas");
        SuspendedArea noReason = new SuspendedArea("south", List.of(), "frequency:south stale", T0);
        assertThat(MessageValidator.validate(status(List.of(noReason))).orElseThrow().field())
                .isEqualTo("suspendedAreas[0].reasons");
        SuspendedArea noTime = new SuspendedArea("south", List.of("frequencyUnusable:south"), "x", 0);
        assertThat(MessageValidator.validate(status(List.of(noTime))).orElseThrow().field())
                .isEqualTo("suspendedAreas[0].since");
    }
}
