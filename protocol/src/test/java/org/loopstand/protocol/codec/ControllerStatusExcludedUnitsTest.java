package org.loopstand.protocol.codec;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.ExcludedUnit;

class ControllerStatusExcludedUnitsTest {
    private static final MessageCodec CODEC = new MessageCodec();
    private static final long T0 = 1_767_225_600_000L;

    private static ControllerStatus status(List<ExcludedUnit> excluded) {
        return new ControllerStatus(7, T0, "agc-a", 3, ControllerState.REGULATING, List.of(), 7,
                List.of(new AreaAce("north", -12.5, -10.0, "normal")), excluded);
    }

    @Test
    void shouldRoundTripTheExcludedUnitsAndOmitThemWhenThereAreNone() {
        ControllerStatus s = status(List.of(new ExcludedUnit("north-hydro-2", "north", "notFollowing", 9.4),
                new ExcludedUnit("north-steam-1", "north", "commandsNotExecuted:expired", 0)));
        byte[] bytes = CODEC.encode(s);
        assertThat(CODEC.decode(bytes, ControllerStatus.class).message()).contains(s);
        String none = new String(CODEC.encode(status(List.of())), StandardCharsets.UTF_8);
        assertThat(none).doesNotContain("excludedUnits");
        assertThat(CODEC.decode(none.getBytes(StandardCharsets.UTF_8), ControllerStatus.class).message().orElseThrow()
                .excludedUnits()).isNull();
    }

    @Test
    void shouldRefuseAnExcludedUnitListedTwiceOrWithoutAFiniteShortfall() {
        ExcludedUnit u = new ExcludedUnit("north-hydro-2", "north", "notFollowing", 9.4);
        assertThat(MessageValidator.validate(status(List.of(u, u))).orElseThrow().field()).startsWith("excludedUnits");
        ControllerStatus nan = status(List.of(new ExcludedUnit("north-hydro-2", "north", "notFollowing", Double.NaN)));
        assertThat(MessageValidator.validate(nan).orElseThrow().field()).isEqualTo("excludedUnits[0].shortfallMw");
    }
}
