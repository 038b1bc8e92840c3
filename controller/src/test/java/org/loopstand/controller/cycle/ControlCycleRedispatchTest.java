package org.loopstand.controller.cycle;

import org.loopstand.controller.schedule.AreaSchedule;

import org.loopstand.controller.intake.AreaCycleInputs;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.dispatch.QuadraticCostUnit;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;

class ControlCycleRedispatchTest {
    private static final long T0 = 1_700_000_000_000L;

    @Test
    void shouldMoveUnitsToNewEconomicBasePointsWithoutChangingTotal() {
        // U1 cheaper at the margin (smaller c): at 300 MW equal lambda gives
        // P1 = 300 * (1/0.02)/(1/0.02 + 1/0.03) = 180, P2 = 120; units start the other way round
        List<QuadraticCostUnit> costs = List.of(new QuadraticCostUnit("U1", 0, 10, 0.01, 50, 250),
                new QuadraticCostUnit("U2", 0, 10, 0.015, 50, 250));
        AreaSetup a = new AreaSetup(AreaControlSettings.builder("A").europeanK(1000).build(),
                RegulationSettings.builder().cycleS(4).filterTimeConstantS(0).quietMw(5).assistMw(300).build(),
                costs, 300_000, 1.0);
        ControlCycle c = new ControlCycle(new ControlCycleSettings(4000, List.of(a), new PulseSettings(200, 4000, true, 0.01),
                new InterlockSettings(2000, 1), FollowingSettings.DEFAULTS, 0, Map.of()));
        Map<String, Double> setpoint = new HashMap<>(Map.of("U1", 120.0, "U2", 180.0));
        for (int n = 0; n < 60; n++) {
            long now = T0 + n * 4000L;
            List<UnitState> units = List.of(unit("U1", setpoint.get("U1"), now), unit("U2", setpoint.get("U2"), now));
            CycleOutcome o = c.step(new CycleInputs(n, now, true, List.of(new AreaCycleInputs("A",
                    ValidatedValue.good(50.0, 100), Map.of("t", ValidatedValue.good(0, 100)), new AreaSchedule(0, 50), 0, 0)),
                    units));
            for (PlannedCommand cmd : o.commands()) {
                assertThat(cmd.kind()).isEqualTo(CommandKind.SETPOINT);
                setpoint.put(cmd.unitId(), cmd.setpointMw());
            }
            assertThat(setpoint.get("U1") + setpoint.get("U2")).isCloseTo(300, within(1e-6));
        }
        assertThat(setpoint.get("U1")).isCloseTo(180, within(1e-6));
        assertThat(setpoint.get("U2")).isCloseTo(120, within(1e-6));
        assertThat(c.basePointsMw("A").get("U1")).isCloseTo(180, within(1e-6));
    }

    private static UnitState unit(String id, double setpointMw, long now) {
        return new UnitState(id, "A", true, true, true, setpointMw, setpointMw, 50, 250, 30, 30, true, now);
    }
}
