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
import org.loopstand.controller.following.GovernorResponse;
import org.loopstand.controller.intake.ValidatedValue;
import org.loopstand.controller.pulse.PlannedCommand;
import org.loopstand.controller.pulse.PulseSettings;
import org.loopstand.controller.regulation.RegulationSettings;
import org.loopstand.controller.config.InterlockSettings;

/**
 * The following check in the closed loop with a quasi-static two-area plant: area A (one unit of
 * 200 MW/Hz governor response, load damping 800 MW/Hz, β_A = 1000 MW/Hz, bias 1000 MW/Hz) tied to an
 * area B of β_B = 1000 MW/Hz without secondary control; a 100 MW load step in A. Steady state of the
 * two-area model with primary response (Saadat ch. 12, from memory): Δf = −(ΔP_load − ΔP_setpoint) /
 * (β_A + β_B), tie flow out of A = β_B·Δf; the unit's output is setpoint − K·Δf.
 */
class ControlCycleFollowingTest {
    private static final long T0 = 1_700_000_000_000L;
    private static final long CYCLE_MS = 4000;
    private static final double K_UNIT_MW_PER_HZ = 200;
    private static final double BETA_MW_PER_HZ = 1000;
    private static final double BETA_OTHER_MW_PER_HZ = 1000;
    private static final double STEP_MW = 100;

    private static ControlCycle cycle() {
        AreaSetup a = AreaSetup.of(AreaControlSettings.builder("A").europeanK(BETA_MW_PER_HZ).build(),
                RegulationSettings.builder().cycleS(4).filterTimeConstantS(0).kp(0.2).integralTimeS(40)
                        .quietMw(5).assistMw(300).build());
        return new ControlCycle(new ControlCycleSettings(CYCLE_MS, List.of(a), new PulseSettings(200, 4000, true, 0.5),
                new InterlockSettings(2000, 1), FollowingSettings.DEFAULTS, 500,
                Map.of("U1", new GovernorResponse(K_UNIT_MW_PER_HZ, 0))));
    }

    /** The plant: the unit's setpoint (moved by setpoint commands it obeys), load step at cycle 3. */
    private static final class Plant {
        double setpointMw = 300;
        boolean obeys = true;
        double loadMw;

        double dfHz() {
            return -(loadMw - (setpointMw - 300)) / (BETA_MW_PER_HZ + BETA_OTHER_MW_PER_HZ);
        }

        double tieMw() {
            return BETA_OTHER_MW_PER_HZ * dfHz();
        }

        UnitState unit(long readingMs) {
            return new UnitState("U1", "A", true, true, true, setpointMw, setpointMw - K_UNIT_MW_PER_HZ * dfHz(), 100,
                    500, 60, 60, true, readingMs);
        }

        void apply(List<PlannedCommand> commands) {
            for (PlannedCommand c : commands) {
                if (obeys) {
                    setpointMw = c.setpointMw();
                }
            }
        }
    }

    private static AreaCycleInputs area(double fHz, long ageMs, double tieMw) {
        return new AreaCycleInputs("A", ValidatedValue.good(fHz, ageMs), Map.of("t1", ValidatedValue.good(tieMw, 500)),
                new AreaSchedule(0, 50), 0, 0);
    }

    @Test
    void shouldNotLockOutAUnitWhoseBaselineCameFromAStaleFrequencyReadingJustAfterAStep() {
        ControlCycle c = cycle();
        Plant plant = new Plant();
        double lastFrequencyHz = 50;
        List<FollowingDecision> decisions = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        CycleOutcome o = null;
        for (int k = 0; k < 120; k++) {
            long now = T0 + k * CYCLE_MS;
            if (k == 3) {
                plant.loadMw = STEP_MW;
            }
            // the frequency meter scanned 3 s before the step cycle: its reading still shows 50 Hz
            // while the tie flow and the unit's output (read at the cycle) already show the step,
            // the output with its governor response; ACE = tie = −50 MW asks for a raise
            AreaCycleInputs a = k == 3 ? area(lastFrequencyHz, 3000, plant.tieMw())
                    : area(50 + plant.dfHz(), 500, plant.tieMw());
            lastFrequencyHz = 50 + plant.dfHz();
            o = c.step(new CycleInputs(k, now, true, List.of(a), List.of(plant.unit(now))));
            plant.apply(o.commands());
            decisions.addAll(o.decisions());
            notes.addAll(o.notes());
        }
        assertThat(decisions).isEmpty();
        assertThat(notes).noneMatch(n -> n.startsWith("noEligibleUnits:A"));
        assertThat(o.excludedUnits()).isEmpty();
        // secondary control took the whole step: the setpoint rose by 100 MW and frequency is back
        // (to within the 5 MW quiet band: |ACE| = (β_A + β_B)·|Δf| ≤ 5 MW)
        assertThat(plant.setpointMw).isCloseTo(400, within(5.0));
        assertThat(plant.dfHz()).isCloseTo(0, within(0.0025));
    }

    @Test
    void shouldExcludeAUnitThatStopsFollowingProbeItAndReadmitItWhenItAnswers() {
        ControlCycle c = cycle();
        Plant plant = new Plant();
        List<FollowingDecision> decisions = new ArrayList<>();
        List<String> excludedAt100 = new ArrayList<>();
        for (int k = 0; k < 150; k++) {
            long now = T0 + k * CYCLE_MS;
            if (k == 3) {
                plant.loadMw = STEP_MW;
                plant.obeys = false; // the unit's command path is stuck
            }
            if (k == 40) {
                plant.obeys = true; // repaired
            }
            CycleOutcome o = c.step(new CycleInputs(k, now, true, List.of(area(50 + plant.dfHz(), 500, plant.tieMw())),
                    List.of(plant.unit(now))));
            plant.apply(o.commands());
            decisions.addAll(o.decisions());
            if (k == 100) {
                excludedAt100.addAll(o.excludedUnits());
            }
        }
        assertThat(decisions).extracting(FollowingDecision::event).startsWith(FollowingDecision.EXCLUDED);
        FollowingDecision excluded = decisions.get(0);
        assertThat(excluded.reason()).isEqualTo("notFollowing");
        assertThat(excluded.unitId()).isEqualTo("U1");
        assertThat(excluded.areaId()).isEqualTo("A");
        assertThat(excluded.missedChecks()).isEqualTo(FollowingSettings.DEFAULTS.missedCyclesToFlag());
        // flagged only when the shortfall exceeded tolerance plus governor allowance
        assertThat(excluded.shortfallMw())
                .isGreaterThan(FollowingSettings.DEFAULTS.toleranceMw() + excluded.allowanceMw());
        assertThat(decisions).anySatisfy(d -> {
            assertThat(d.event()).isEqualTo(FollowingDecision.PROBE_SENT);
            assertThat(Math.abs(d.probeMw())).isCloseTo(FollowingSettings.DEFAULTS.probeMw(), within(1e-9));
        });
        // a probe sent while the unit was still stuck failed, and the next was sent an interval later
        assertThat(decisions).extracting(FollowingDecision::event).containsSubsequence(FollowingDecision.PROBE_SENT,
                FollowingDecision.PROBE_FAILED, FollowingDecision.PROBE_SENT, FollowingDecision.READMITTED);
        FollowingDecision last = decisions.get(decisions.size() - 1);
        assertThat(last.event()).isEqualTo(FollowingDecision.READMITTED);
        assertThat(last.reason()).isEqualTo("probeFollowed");
        assertThat(excludedAt100).isEmpty();
        // back in the allocation, the unit took the step: frequency restored
        assertThat(plant.dfHz()).isCloseTo(0, within(0.0025)); // the 5 MW quiet band: (β_A + β_B)·|Δf| ≤ 5 MW
    }
}
