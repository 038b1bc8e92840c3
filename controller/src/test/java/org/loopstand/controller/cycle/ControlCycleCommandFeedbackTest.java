package org.loopstand.controller.cycle;

import org.loopstand.controller.schedule.AreaSchedule;

import org.loopstand.controller.intake.AreaCycleInputs;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.following.FollowingDecision;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;
import org.loopstand.controller.safety.InterlockState;

class ControlCycleCommandFeedbackTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final long CYCLE_MS = 4000;

    private static ControlCycle cycle() {
        AreaSetup a = AreaSetup.of(AreaControlSettings.builder("A").europeanK(1000).build(),
                RegulationSettings.builder().cycleS(4).filterTimeConstantS(0).kp(0.2).integralTimeS(40)
                        .quietMw(5).assistMw(300).build());
        return new ControlCycle(new ControlCycleSettings(CYCLE_MS, List.of(a), new PulseSettings(200, 4000, true, 0.5),
                new InterlockSettings(2000, 1), FollowingSettings.DEFAULTS, 500, Map.of()));
    }

    /**
     * f 49.95 Hz, tie −50 MW: ACE = −50 + 1000·(−0.05) = −100 MW; a unit that never moves, fast
     * enough (6000 MW/min) that no move is cut by its ramp.
     */
    private static CycleOutcome step(ControlCycle c, int k) {
        long now = T0 + k * CYCLE_MS;
        AreaCycleInputs a = new AreaCycleInputs("A", ValidatedValue.good(49.95, 500),
                Map.of("t1", ValidatedValue.good(-50, 500)), new AreaSchedule(0, 50), 0, 0);
        UnitState u = new UnitState("U1", "A", true, true, true, 200, 200, 50, 450, 6000, 6000, true, now);
        return c.step(new CycleInputs(k, now, true, List.of(a), List.of(u)));
    }

    @Test
    void shouldNotIntegrateOnCommandsThatWereRefused() {
        ControlCycle c = cycle();
        List<Double> levels = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        // four refusals in a row (the fifth would exclude the unit, see below)
        for (int k = 0; k < 5; k++) {
            CycleOutcome o = step(c, k);
            levels.add(o.areas().get(0).regulation().levelMw());
            notes.addAll(o.notes());
            for (PlannedCommand cmd : k < 4 ? o.commands() : List.<PlannedCommand>of()) {
                c.commandNotExecuted(cmd.unitId(), cmd.deltaMw(), "atLimit");
            }
        }
        // PI by hand: the first cycle starts bumpless from the units' level 0 (integrator = −kp·e), so
        // each integrated cycle adds (cycleS/Ti)·e = 0.1·100 = 10 MW: 10 MW at cycle 0, 20 MW at
        // cycle 1. From then on every cycle follows a refused command, its integration is withheld
        // and the level stays at 20 MW instead of growing by 10 MW a cycle (50 MW by cycle 4).
        assertThat(levels.get(0)).isCloseTo(10, within(1e-9));
        for (int k = 1; k < 5; k++) {
            assertThat(levels.get(k)).as("cycle %d", k).isCloseTo(20, within(1e-9));
        }
        assertThat(notes).contains("commandNotExecuted:U1:atLimit");
    }

    @Test
    void shouldNotJudgeAUnitOnRefusedMovesButExcludeItWhenItsCommandsKeepFailing() {
        ControlCycle c = cycle();
        List<FollowingDecision> decisions = new ArrayList<>();
        int excludedAt = -1;
        for (int k = 0; k < 20; k++) {
            CycleOutcome o = step(c, k);
            decisions.addAll(o.decisions());
            if (excludedAt < 0 && !o.excludedUnits().isEmpty()) {
                excludedAt = k;
            }
            for (PlannedCommand cmd : o.commands()) {
                c.commandNotExecuted(cmd.unitId(), cmd.deltaMw(), "notInRemote");
            }
        }
        // refusals after cycles 0..4: five in a row (missedCyclesToFlag) exclude it, reported at cycle 5
        assertThat(excludedAt).isEqualTo(5);
        assertThat(decisions).noneMatch(d -> d.reason().equals("notFollowing"));
        assertThat(decisions.get(0).event()).isEqualTo(FollowingDecision.EXCLUDED);
        assertThat(decisions.get(0).reason()).isEqualTo("commandsNotExecuted:notInRemote");
        assertThat(decisions.get(0).missedChecks()).isEqualTo(5);
    }

    @Test
    void shouldSuspendForGoodWhenAUnitRefusesACommandAsFromAStaleEpoch() {
        ControlCycle c = cycle();
        CycleOutcome first = step(c, 0);
        assertThat(first.state()).isEqualTo(InterlockState.REGULATING);
        PlannedCommand cmd = first.commands().get(0);
        c.commandNotExecuted(cmd.unitId(), cmd.deltaMw(), "wrongEpoch");
        for (int k = 1; k < 5; k++) {
            CycleOutcome o = step(c, k);
            assertThat(o.state()).isEqualTo(InterlockState.SUSPENDED);
            assertThat(o.reasons()).containsExactly("staleEpoch:U1");
            assertThat(o.commands()).isEmpty();
        }
    }
}
