package org.loopstand.plant.live;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.ControllerState;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.ExcludedUnit;
import org.loopstand.protocol.message.SuspendedArea;

class LiveSnapshotTest {
    @Test
    void shouldShowTheAreasTheControllerHoldsAndTheUnitsItLeavesOutWithTheirReasons() {
        ControllerStatus st = new ControllerStatus(9, 1_000L, "controller-1", 1L, ControllerState.REGULATING, List.of(), 9,
                List.of(new AreaAce("south-ridge", -3.5, -3.1, "quiet")),
                List.of(new ExcludedUnit("ridge-hydro-2", "south-ridge", "notFollowing", 12.5)),
                List.of(new SuspendedArea("north-basin", List.of("frequencyUnusable:north-basin", "aceUnusable:north-basin"),
                        "frozen 22.6 s", 1_000L)));

        LiveSnapshot.ControllerView v = LiveSnapshot.ControllerView.of(st, 0.4);

        assertThat(v.state()).isEqualTo("regulating");
        assertThat(v.heldAreas()).containsExactly("north-basin (frequencyUnusable:north-basin, aceUnusable:north-basin)");
        assertThat(v.excludedUnits()).containsExactly("ridge-hydro-2 (notFollowing)");
        assertThat(v.ageS()).isEqualTo(0.4);
        LiveSnapshot.ControllerView quiet = LiveSnapshot.ControllerView.of(new ControllerStatus(10, 2_000L, "controller-1", 1L,
                ControllerState.SUSPENDED, List.of("linkDown"), 10, List.of()), 1.0);
        assertThat(quiet.state()).isEqualTo("suspended");
        assertThat(quiet.reasons()).containsExactly("linkDown");
        assertThat(quiet.heldAreas()).isEmpty();
        assertThat(quiet.excludedUnits()).isEmpty();
    }
}
