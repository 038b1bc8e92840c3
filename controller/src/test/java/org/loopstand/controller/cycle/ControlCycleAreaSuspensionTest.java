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
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;
import org.loopstand.controller.safety.InterlockState;

/** Only the area whose data are unusable is suspended; a bad tie suspends both its ends. */
class ControlCycleAreaSuspensionTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final long CYCLE_MS = 4000;
    private static final ValidatedValue FROZEN = ValidatedValue.unusable(Set.of(ValidationReason.FROZEN), 1_200);

    private static ControlCycle cycle(int resumeAfter) {
        RegulationSettings reg = RegulationSettings.builder().cycleS(4).filterTimeConstantS(0).kp(0.2).integralTimeS(40)
                .quietMw(5).assistMw(300).build();
        return new ControlCycle(new ControlCycleSettings(CYCLE_MS, List.of(
                AreaSetup.of(AreaControlSettings.builder("A").europeanK(1000).build(), reg),
                AreaSetup.of(AreaControlSettings.builder("B").europeanK(1000).build(), reg)),
                new PulseSettings(200, 4000, false, 0.5), new InterlockSettings(2000, resumeAfter),
                FollowingSettings.DEFAULTS, 500, Map.of()));
    }

    /** Both areas short: f 49.95 Hz, tie flow at schedule (0) seen from both ends, ACE = 1000 × −0.05 = −50 MW. */
    private static List<AreaCycleInputs> areas(ValidatedValue fA, ValidatedValue tieAtA, ValidatedValue tieAtB) {
        return List.of(new AreaCycleInputs("A", fA, Map.of("tAB", tieAtA), new AreaSchedule(0, 50), 0, 0),
                new AreaCycleInputs("B", ValidatedValue.good(49.95, 500), Map.of("tAB", tieAtB), new AreaSchedule(0, 50), 0, 0));
    }

    private static List<AreaCycleInputs> good() {
        return areas(ValidatedValue.good(49.95, 500), ValidatedValue.good(0, 500), ValidatedValue.good(0, 500));
    }

    private static List<UnitState> units(long telemetryMs) {
        return List.of(new UnitState("UA", "A", true, true, true, 100, 100, 50, 250, 60, 60, false, telemetryMs),
                new UnitState("UB", "B", true, true, true, 100, 100, 50, 250, 60, 60, false, telemetryMs));
    }

    private static List<String> unitsCommanded(CycleOutcome o) {
        return o.commands().stream().map(PlannedCommand::unitId).toList();
    }

    @Test
    void shouldSuspendOnlyTheAreaWhoseFrequencyFrozeWhileTheOtherKeepsRegulating() {
        ControlCycle c = cycle(1);
        CycleOutcome both = c.step(new CycleInputs(0, T0, true, good(), units(T0)));
        assertThat(unitsCommanded(both)).containsExactly("UA", "UB");
        assertThat(both.suspendedAreas()).isEmpty();

        CycleOutcome frozen = c.step(new CycleInputs(1, T0 + CYCLE_MS, true,
                areas(FROZEN, ValidatedValue.good(0, 500), ValidatedValue.good(0, 500)), units(T0 + CYCLE_MS)));
        // the controller regulates on: only A is out, with its reason and figures
        assertThat(frozen.state()).isEqualTo(InterlockState.REGULATING);
        assertThat(frozen.reasons()).isEmpty();
        assertThat(frozen.suspendedAreas()).singleElement().satisfies(a -> {
            assertThat(a.areaId()).isEqualTo("A");
            assertThat(a.reasons()).containsExactly("frequencyUnusable:A");
            assertThat(a.detail()).isEqualTo("frequency:A frozen ageMs=1200");
            assertThat(a.suspendedNow()).isTrue();
            assertThat(a.suspendedSinceMs()).isEqualTo(T0 + CYCLE_MS);
        });
        assertThat(unitsCommanded(frozen)).containsExactly("UB");
        assertThat(frozen.areas().get(0).ace()).isNull();
        // B's ACE is its own: −50 MW from its frequency and its end of the tie, untouched by A's meter
        assertThat(frozen.areas().get(1).aceMw()).isCloseTo(-50, within(1e-9));
    }

    @Test
    void shouldSuspendBothEndsOfATieWhoseFlowIsUnusableAtOneEnd() {
        ControlCycle c = cycle(1);
        c.step(new CycleInputs(0, T0, true, good(), units(T0)));
        CycleOutcome o = c.step(new CycleInputs(1, T0 + CYCLE_MS, true,
                areas(ValidatedValue.good(49.95, 500), ValidatedValue.good(0, 500),
                        ValidatedValue.unusable(Set.of(ValidationReason.STALE, ValidationReason.HOLD_EXPIRED), 18_400)),
                units(T0 + CYCLE_MS)));
        assertThat(o.state()).isEqualTo(InterlockState.SUSPENDED);
        assertThat(o.commands()).isEmpty();
        assertThat(o.suspendedAreas()).extracting(AreaInterlockState::areaId).containsExactly("A", "B");
        // both name the end whose reading is unusable (B's), with its figures
        assertThat(o.suspendedAreas()).allSatisfy(a -> {
            assertThat(a.reasons()).containsExactly("tieFlowUnusable:B:tAB");
            assertThat(a.detail()).isEqualTo("tieFlow:B:tAB stale,holdExpired ageMs=18400");
        });
        assertThat(o.reasons()).containsExactly("tieFlowUnusable:B:tAB");
    }

    @Test
    void shouldSuspendEveryAreaWhileTheBusLinkIsDown() {
        ControlCycle c = cycle(1);
        c.step(new CycleInputs(0, T0, true, good(), units(T0)));
        CycleOutcome o = c.step(new CycleInputs(1, T0 + CYCLE_MS, false, good(), units(T0 + CYCLE_MS)));
        assertThat(o.state()).isEqualTo(InterlockState.SUSPENDED);
        assertThat(o.suspendedAreas()).extracting(AreaInterlockState::reasons)
                .containsExactly(List.of("busLinkDown"), List.of("busLinkDown"));
    }

    @Test
    void shouldResumeTheSuspendedAreaWithoutABumpAfterItsClearCycles() {
        ControlCycle c = cycle(2);
        long t = T0;
        // start-up: two clear cycles, then both regulate
        c.step(new CycleInputs(0, t, true, good(), units(t)));
        CycleOutcome first = c.step(new CycleInputs(1, t += CYCLE_MS, true, good(), units(t)));
        assertThat(first.suspendedAreas()).isEmpty();
        double levelBefore = first.areas().get(0).regulation().levelMw();
        // A's frequency frozen for three cycles: A's regulator is frozen, B integrates on
        for (int i = 0; i < 3; i++) {
            CycleOutcome o = c.step(new CycleInputs(2 + i, t += CYCLE_MS, true,
                    areas(FROZEN, ValidatedValue.good(0, 500), ValidatedValue.good(0, 500)), units(t)));
            assertThat(unitsCommanded(o)).containsExactly("UB");
        }
        // thawed: one clear cycle is not enough (resumeAfterClearCycles 2), the second resumes A
        CycleOutcome clear1 = c.step(new CycleInputs(5, t += CYCLE_MS, true, good(), units(t)));
        assertThat(clear1.suspendedAreas()).singleElement().satisfies(a -> {
            assertThat(a.reasons()).containsExactly("frequencyUnusable:A");
            assertThat(a.resumedNow()).isFalse();
        });
        assertThat(unitsCommanded(clear1)).containsExactly("UB");
        CycleOutcome resumed = c.step(new CycleInputs(6, t += CYCLE_MS, true, good(), units(t)));
        assertThat(resumed.suspendedAreas()).isEmpty();
        assertThat(resumed.areaStates().get(0).resumedNow()).isTrue();
        // bumpless: the PI starts from where A's unit is (level 0 against its base point) and adds one
        // integral step of 4/40 × 50 = 5 MW, as on the start-up resume; not the P part (0.2 × 50 = 10 MW)
        // and nothing of the four cycles A was out (the integrator did not run: another 4 × 5 MW)
        assertThat(levelBefore).isCloseTo(5, within(1e-9));
        assertThat(resumed.areas().get(0).regulation().levelMw()).isCloseTo(5, within(1e-9));
        assertThat(unitsCommanded(resumed)).contains("UA");
    }
}
