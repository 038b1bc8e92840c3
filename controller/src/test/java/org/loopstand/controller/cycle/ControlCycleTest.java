package org.loopstand.controller.cycle;

import org.loopstand.controller.schedule.AreaSchedule;

import org.loopstand.controller.intake.AreaCycleInputs;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.ace.AreaControlSettings;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.following.FollowingSettings;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.intake.ValidationReason;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.AceBand;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;
import org.loopstand.controller.safety.InterlockState;

class ControlCycleTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final long CYCLE_MS = 4000;

    private static ControlCycle cycle(int resumeAfter) {
        return cycle(resumeAfter, AreaControlSettings.builder("A").europeanK(1000).build());
    }

    private static ControlCycle cycle(int resumeAfter, AreaControlSettings ace) {
        AreaSetup a = AreaSetup.of(ace,
                RegulationSettings.builder().cycleS(4).filterTimeConstantS(0).kp(0.2).integralTimeS(40)
                        .quietMw(5).assistMw(300).build());
        return new ControlCycle(new ControlCycleSettings(CYCLE_MS, List.of(a), new PulseSettings(200, 4000, false, 0.5),
                new InterlockSettings(2000, resumeAfter), FollowingSettings.DEFAULTS, 500, Map.of()));
    }

    private static AreaCycleInputs area(double fHz, double tieMw) {
        return new AreaCycleInputs("A", ValidatedValue.good(fHz, 500), Map.of("t1", ValidatedValue.good(tieMw, 500)),
                new AreaSchedule(0, 50), 0, 0);
    }

    private static UnitState unit(String id, double setpointMw, long telemetryTimeMs) {
        return new UnitState(id, "A", true, true, true, setpointMw, setpointMw, 50, 250, 60, 60, false, telemetryTimeMs);
    }

    @Test
    void shouldSendRaisePulsesWhenGenerationIsShort() {
        ControlCycle c = cycle(1);
        // f 49.95 Hz, tie -50 MW (importing): ACE = -50 + 1000*(-0.05) = -100 MW -> raise
        CycleOutcome o = c.step(new CycleInputs(0, T0, true, List.of(area(49.95, -50)),
                List.of(unit("U1", 100, T0), unit("U2", 150, T0))));
        assertThat(o.state()).isEqualTo(InterlockState.REGULATING);
        assertThat(o.areas().get(0).aceMw()).isCloseTo(-100, within(1e-9));
        assertThat(o.areas().get(0).regulation().band()).isEqualTo(AceBand.REGULATING);
        assertThat(o.commands()).hasSize(2).allSatisfy(cmd -> {
            assertThat(cmd.direction()).isEqualTo(PulseDirection.RAISE);
            assertThat(cmd.validUntilMs()).isEqualTo(T0 + CYCLE_MS);
        });
        // level = 0.2*100 + 4/40*100 = 30 MW, equal shares 15 MW, ramp 60 MW/min -> 4 MW per cycle
        assertThat(o.commands()).extracting(PlannedCommand::deltaMw).containsOnly(4.0);
    }

    @Test
    void shouldPlanNothingFromUnusableFrequency() {
        ControlCycle c = cycle(1);
        AreaCycleInputs bad = new AreaCycleInputs("A", ValidatedValue.unusable(Set.of(ValidationReason.STALE), 12_000),
                Map.of("t1", ValidatedValue.good(-50, 500)), new AreaSchedule(0, 50), 0, 0);
        CycleOutcome o = c.step(new CycleInputs(0, T0, true, List.of(bad), List.of(unit("U1", 100, T0))));
        assertThat(o.state()).isEqualTo(InterlockState.SUSPENDED);
        assertThat(o.commands()).isEmpty();
        assertThat(o.reasons()).containsExactly("frequencyUnusable:A");
        assertThat(o.areas().get(0).ace()).isNull();
    }

    @Test
    void shouldSuspendOnBusLinkDownAndAceSanity() {
        ControlCycle c = cycle(1);
        CycleOutcome down = c.step(new CycleInputs(0, T0, false, List.of(area(49.95, -50)), List.of(unit("U1", 100, T0))));
        assertThat(down.reasons()).containsExactly("busLinkDown");
        assertThat(down.commands()).isEmpty();
        CycleOutcome insane = c.step(new CycleInputs(1, T0 + CYCLE_MS, true, List.of(area(47.0, 0)),
                List.of(unit("U1", 100, T0))));
        assertThat(insane.reasons()).containsExactly("aceBeyondSanityLimit:A");
        assertThat(insane.areas().get(0).aceMw()).isCloseTo(-3000, within(1e-6));
    }

    @Test
    void shouldSendNothingInQuietBand() {
        ControlCycle c = cycle(1);
        CycleOutcome o = c.step(new CycleInputs(0, T0, true, List.of(area(50.0, 3)), List.of(unit("U1", 100, T0))));
        assertThat(o.areas().get(0).regulation().band()).isEqualTo(AceBand.QUIET);
        assertThat(o.commands()).isEmpty();
    }

    @Test
    void shouldUseCommandedSetpointWhileTelemetryLags() {
        ControlCycle c = cycle(1);
        List<AreaCycleInputs> short100 = List.of(area(49.95, -50));
        CycleOutcome first = c.step(new CycleInputs(0, T0, true, short100, List.of(unit("U1", 100, T0))));
        assertThat(first.commands()).extracting(PlannedCommand::deltaMw).containsExactly(4.0);
        // telemetry still from before the pulse ended: the cycle assumes 104 MW, not 100 MW, so the
        // next move starts from 104 (target 108 after ramp), and is not the same 4 MW again from 100
        CycleOutcome second = c.step(new CycleInputs(1, T0 + CYCLE_MS, true, short100,
                List.of(unit("U1", 100, T0 + 1000))));
        assertThat(second.areas().get(0).allocation().units().get(0).targetMw()).isCloseTo(108, within(1e-9));
    }

    @Test
    void shouldResumeWithoutBump() {
        ControlCycle c = cycle(2);
        List<UnitState> units = List.of(unit("U1", 120, T0), unit("U2", 150, T0));
        // first cycles: interlock not yet clear long enough
        CycleOutcome o0 = c.step(new CycleInputs(0, T0, true, List.of(area(50.0, 10)), units));
        assertThat(o0.state()).isEqualTo(InterlockState.SUSPENDED);
        CycleOutcome o1 = c.step(new CycleInputs(1, T0 + CYCLE_MS, true, List.of(area(50.0, 10)), units));
        assertThat(o1.state()).isEqualTo(InterlockState.REGULATING);
        // base points taken from where the units are, the PI tracks level 0, so the P part does not
        // jump in: ACE = +10 -> level = 0 + one integral step 4/40*(-10) = -1 MW (not kp*(-10) - 1 = -3)
        assertThat(o1.areas().get(0).regulation().levelMw()).isCloseTo(-1, within(1e-9));
        assertThat(c.basePointsMw("A")).containsEntry("U1", 120.0).containsEntry("U2", 150.0);
        assertThat(o1.commands()).extracting(PlannedCommand::deltaMw).containsOnly(-0.5);
    }

    @Test
    void shouldGiveSameCommandsInBothConventions() {
        // B = -100 MW/0.1 Hz is K = 1000 MW/Hz; over-generation: f high, exporting more than scheduled
        ControlCycle na = cycle(1, AreaControlSettings.builder("A").northAmericanBias(-100).build());
        ControlCycle eu = cycle(1, AreaControlSettings.builder("A").europeanK(1000).build());
        CycleInputs in = new CycleInputs(0, T0, true, List.of(area(50.04, 30)), List.of(unit("U1", 100, T0)));
        CycleOutcome a = na.step(in);
        CycleOutcome b = eu.step(in);
        assertThat(a.areas().get(0).aceMw()).isCloseTo(70, within(1e-9));
        assertThat(a.commands()).hasSize(1);
        assertThat(a.commands().get(0).direction()).isEqualTo(PulseDirection.LOWER);
        assertThat(b.commands()).isEqualTo(a.commands());
    }

    @Test
    void shouldRegulateOnHeldFrequencyAndSuspendOnBadTie() {
        ControlCycle c = cycle(1);
        ValidatedValue held = new ValidatedValue(49.95, true, Set.of(ValidationReason.STALE, ValidationReason.HELD_LAST_GOOD),
                true, 12_000);
        CycleOutcome o = c.step(new CycleInputs(0, T0, true, List.of(new AreaCycleInputs("A", held,
                Map.of("t1", ValidatedValue.good(-50, 500)), new AreaSchedule(0, 50), 0, 0)), List.of(unit("U1", 100, T0))));
        assertThat(o.state()).isEqualTo(InterlockState.REGULATING);
        assertThat(o.commands()).isNotEmpty();
        CycleOutcome bad = c.step(new CycleInputs(1, T0 + CYCLE_MS, true, List.of(new AreaCycleInputs("A",
                ValidatedValue.good(49.95, 100), Map.of("t1", ValidatedValue.good(-50, 500),
                        "t2", ValidatedValue.unusable(Set.of(ValidationReason.BAD_QUALITY), 100)),
                new AreaSchedule(0, 50), 0, 0)), List.of(unit("U1", 104, T0 + CYCLE_MS))));
        assertThat(bad.state()).isEqualTo(InterlockState.SUSPENDED);
        assertThat(bad.reasons()).containsExactly("tieFlowUnusable:A:t2");
        assertThat(bad.commands()).isEmpty();
        assertThat(bad.areas().get(0).ace()).isNull();
    }
}
