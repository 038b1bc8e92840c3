package org.loopstand.controller.following;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class UnitFollowingMonitorTest {
    private static final long T0 = 1_000_000L;
    private static final long CYCLE = 4000;
    // dead time 4 s, tolerance 1 MW, flag after 3 misses, return after 2 passes
    private final FollowingSettings settings = new FollowingSettings(4000, 1.0, 3, 2);

    @Test
    void shouldPassUnitThatMovesAtItsRampAfterDeadTime() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 100);
        // ramp 60 MW/min = 1 MW/s; the unit starts after its 4 s dead time
        for (int k = 1; k <= 6; k++) {
            long t = T0 + k * CYCLE;
            double measured = 100 + Math.min(10, Math.max(0, (t - T0 - 4000) / 1000.0));
            FollowingCheck c = m.check("U1", t, measured, 60);
            assertThat(c.following()).as("check %d", k).isTrue();
        }
        assertThat(m.flagged("U1")).isFalse();
    }

    /**
     * A unit at its 300 MW upper limit keeps receiving setpoint 300 while its reported setpoint still lags
     * the command before (each move reckoned from the report: +1.5 MW a cycle); its output sits on 300 MW.
     * With the target kept within the regulating limits it passes every check; without, the summed moves
     * climb past the limit and the unit is flagged for staying where it was told to be. A unit that does not
     * move below its limit is still flagged.
     */
    @Test
    void shouldKeepTheTargetWithinTheUnitsLimitsSoAUnitOnItsLimitIsNotFlagged() {
        UnitFollowingMonitor limited = new UnitFollowingMonitor(settings);
        UnitFollowingMonitor unlimited = new UnitFollowingMonitor(settings);
        UnitFollowingMonitor stuckBelow = new UnitFollowingMonitor(settings);
        for (int k = 0; k <= 8; k++) {
            long t = T0 + k * CYCLE;
            if (k > 0) {
                assertThat(limited.check("H1", t, 300, 60).following()).as("check %d", k).isTrue();
                unlimited.check("H1", t, 300, 60);
                stuckBelow.check("H1", t, 280, 60);
            }
            limited.onCommand("H1", 1.5, t, 300);
            limited.limitTarget("H1", 50, 300);
            unlimited.onCommand("H1", 1.5, t, 300);
            stuckBelow.onCommand("H1", 1.5, t, 280);
            stuckBelow.limitTarget("H1", 50, 300);
        }
        assertThat(limited.flagged("H1")).isFalse();
        assertThat(unlimited.flagged("H1")).isTrue();
        assertThat(stuckBelow.flagged("H1")).isTrue();
    }

    @Test
    void shouldFlagUnitThatDoesNotMoveAndReturnItWhenItCatchesUp() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 100);
        FollowingCheck c = null;
        for (int k = 1; k <= 4; k++) {
            c = m.check("U1", T0 + k * CYCLE, 100, 60);
        }
        // expected at t-4s = 100 + min(10, (4k-4) s * 1 MW/s): misses at k = 2, 3, 4
        assertThat(c.flagged()).isTrue();
        assertThat(c.shortfallMw()).isCloseTo(10, within(1e-9));
        assertThat(m.flaggedUnits()).containsExactly("U1");
        FollowingCheck back1 = m.check("U1", T0 + 5 * CYCLE, 110, 60);
        assertThat(back1.following()).isTrue();
        assertThat(back1.flagged()).isTrue();
        FollowingCheck back2 = m.check("U1", T0 + 6 * CYCLE, 110, 60);
        assertThat(back2.returnedNow()).isTrue();
        assertThat(m.flagged("U1")).isFalse();
    }

    /**
     * A unit whose output lags its setpoint by 40 s (first-order, e.g. a hydro unit's transient droop
     * compensation) walked 1.33 MW per cycle for 300 s: with its lag it is never flagged; without it,
     * it falls behind the ramp by 0.333 MW/s × (40 − 4) s = 12 MW and is; one that does not move at
     * all is still flagged with the lag.
     */
    @Test
    void shouldAllowForTheUnitsResponseLagButStillFlagOneThatDoesNotMove() {
        UnitFollowingMonitor lagged = new UnitFollowingMonitor(settings);
        lagged.responseLag("H1", 40);
        UnitFollowingMonitor plain = new UnitFollowingMonitor(settings);
        UnitFollowingMonitor stuck = new UnitFollowingMonitor(settings);
        stuck.responseLag("H1", 40);
        double setpoint = 150;
        double output = 150;
        int plainFlaggedCycles = 0;
        for (int k = 0; k < 150; k++) {
            long t = T0 + k * CYCLE;
            if (k < 75) {
                lagged.onCommand("H1", 1.333, t, output);
                plain.onCommand("H1", 1.333, t, output);
                stuck.onCommand("H1", 1.333, t, 150);
                setpoint += 1.333;
            }
            // the plant: a first-order lag of 40 s on the setpoint, integrated in 100 ms steps
            for (int i = 0; i < 40; i++) {
                output += (setpoint - output) * 0.1 / 40;
            }
            lagged.check("H1", t + CYCLE, output, 40);
            plain.check("H1", t + CYCLE, output, 40);
            stuck.check("H1", t + CYCLE, 150, 40);
            assertThat(lagged.flagged("H1")).as("lagged unit at cycle %d", k).isFalse();
            plainFlaggedCycles += plain.flagged("H1") ? 1 : 0;
        }
        // judged with the dead time alone it is out of the allocation for most of its walk (and back once it
        // catches up at the end)
        assertThat(plainFlaggedCycles).isGreaterThan(50);
        assertThat(stuck.flagged("H1")).isTrue();
        // 300 s after the last command the expected output is within a tenth of the tolerance: idle again
        assertThat(lagged.idle("H1")).isTrue();
    }

    @Test
    void shouldFlagUnitMovingTheWrongWay() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", -5, T0, 100);
        for (int k = 1; k <= 4; k++) {
            m.check("U1", T0 + k * CYCLE, 100 + k, 60);
        }
        assertThat(m.flagged("U1")).isTrue();
        m.reset("U1");
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldNotJudgeDriftWithoutCommands() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        for (int k = 0; k < 10; k++) {
            FollowingCheck c = m.check("U1", T0 + k * CYCLE, 100 + 3 * k, 60);
            assertThat(c.evaluated()).isFalse();
        }
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldNotFlagAUnitWhoseLagIsExplainedByItsGovernorAllowance() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        // a frequency excursion is under way: the governor share may be 12 MW off at the command
        m.onCommand("U1", 10, T0, 100, 12);
        for (int k = 1; k <= 6; k++) {
            // the governor-corrected output has not moved yet (the turbine still answers the frequency)
            FollowingCheck c = m.check("U1", T0 + k * CYCLE, 100, 60, 0.5);
            assertThat(c.following()).as("check %d", k).isTrue();
            assertThat(c.allowanceMw()).isCloseTo(12.5, within(1e-9));
        }
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldFlagAUnitThatFallsShortByMoreThanGovernorActionCouldExplain() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 30, T0, 100, 5);
        FollowingCheck c = null;
        for (int k = 1; k <= 6; k++) {
            c = m.check("U1", T0 + k * CYCLE, 100, 60, 2);
        }
        // expected 100 + min(30, 4k − 4): 12, 16, 20 MW short at k = 4..6 > 1 + 5 + 2 MW
        assertThat(c.shortfallMw()).isCloseTo(20, within(1e-9));
        assertThat(c.flagged()).isTrue();
    }

    @Test
    void shouldKeepTheLargestGovernorAllowanceOfTheMoveAfterTheWindowHasPassedTheDisturbance() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        // baseline 10 MW high (taken while the governor share was in it), allowance 0 at the baseline
        m.onCommand("U1", 4, T0, 110, 0);
        FollowingCheck c = null;
        for (int k = 1; k <= 10; k++) {
            // 12 MW of governor spread while the excursion is in the window, then none
            double uncertainty = k <= 3 ? 12 : 0;
            c = m.check("U1", T0 + k * CYCLE, 104, 60, uncertainty);
        }
        // 10 MW short of 114 MW, within 1 + 12 MW: the share seen during the move is still allowed for
        assertThat(c.shortfallMw()).isCloseTo(10, within(1e-9));
        assertThat(c.allowanceMw()).isCloseTo(12, within(1e-9));
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldJudgeEachReadingOnceAndAtItsOwnTime() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 100);
        // the same reading (taken at T0 + 4 s) seen by five cycles: judged once, against what the unit
        // could have done by then (expected at T0 + 4 s − 4 s dead time = 100 MW)
        for (int k = 1; k <= 5; k++) {
            FollowingCheck c = m.check("U1", T0 + k * CYCLE, T0 + CYCLE, 100, 60, 0);
            assertThat(c.evaluated()).isEqualTo(k == 1);
            assertThat(c.following()).isTrue();
        }
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldCorrectABaselineWhenTheFrequencyValidAtItsReadingArrives() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 120);
        m.rebase("U1", -20); // the governor share of 20 MW in the baseline becomes known
        for (int k = 1; k <= 6; k++) {
            double measured = 100 + Math.min(10, Math.max(0, (k * CYCLE - 4000) / 1000.0));
            assertThat(m.check("U1", T0 + k * CYCLE, measured, 60).following()).as("check %d", k).isTrue();
        }
        assertThat(m.idle("U1")).isTrue();
    }

    @Test
    void shouldReadmitAFlaggedUnitOnlyWhenItCompletesAProbeInTime() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 100);
        long t = T0;
        for (int k = 1; k <= 4; k++) {
            t = T0 + k * CYCLE;
            m.check("U1", t, 100, 60);
        }
        assertThat(m.flagged("U1")).isTrue();
        assertThat(m.probeDue("U1", t)).isFalse();
        long due = t + FollowingSettings.DEFAULT_PROBE_INTERVAL_MS;
        assertThat(m.probeDue("U1", due)).isTrue();
        // first probe: the unit does not move; deadline 2 · 4 s + 5 MW at 60 MW/min = 13 s
        m.startProbe("U1", 5, due, 100, 0, 60);
        FollowingCheck failed = null;
        for (int k = 1; k <= 4 && failed == null; k++) {
            FollowingCheck c = m.check("U1", due + k * CYCLE, 100, 60);
            assertThat(c.probing()).isTrue();
            failed = c.probeFailedNow() ? c : null;
        }
        assertThat(failed).isNotNull();
        assertThat(failed.flagged()).isTrue();
        long next = due + 4 * CYCLE + FollowingSettings.DEFAULT_PROBE_INTERVAL_MS;
        assertThat(m.probeDue("U1", next - 1)).isFalse();
        assertThat(m.probeDue("U1", next)).isTrue();
        // second probe: the unit makes it after its dead time
        m.startProbe("U1", 5, next, 100, 0, 60);
        FollowingCheck back = null;
        for (int k = 1; k <= 4 && back == null; k++) {
            FollowingCheck c = m.check("U1", next + k * CYCLE, k == 1 ? 100 : 105, 60);
            back = c.returnedNow() ? c : null;
        }
        assertThat(back).isNotNull();
        assertThat(back.probing()).isTrue();
        assertThat(m.flagged("U1")).isFalse();
    }

    @Test
    void shouldNotReturnAFlaggedUnitThatPassesOnlyThanksToTheGovernorAllowance() {
        UnitFollowingMonitor m = new UnitFollowingMonitor(settings);
        m.onCommand("U1", 10, T0, 100, 0);
        for (int k = 1; k <= 4; k++) {
            m.check("U1", T0 + k * CYCLE, 100, 60, 0);
        }
        assertThat(m.flagged("U1")).isTrue();
        // a frequency excursion gives 20 MW of allowance: the idle unit passes but is not back
        for (int k = 5; k <= 10; k++) {
            assertThat(m.check("U1", T0 + k * CYCLE, 100, 60, 20).following()).isTrue();
        }
        assertThat(m.flagged("U1")).isTrue();
    }
}
