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
}
