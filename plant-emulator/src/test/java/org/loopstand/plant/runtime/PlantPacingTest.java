package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.VirtualClock;

/** The pace keeper against a scenario clock over a virtual wall clock. */
class PlantPacingTest {
    final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    final HeldStartClock clock = new HeldStartClock(wall, 40);
    final List<Map<String, Object>> journal = new ArrayList<>();
    final PlantPacing pacing = new PlantPacing(clock, wall, 20_000_000L,
            new PacingSettings(1.0, 1.1, 0.8, 5.0), journal::add);

    {
        clock.release();
        pacing.started();
    }

    @Test
    void shouldHoldTheClockWhileThePhysicsCatchesUpThenRunOnSlowerAndLaterRaiseTheRateAgain() {
        wall.advanceMillis(100);
        pacing.onStep(500_000_000L); // 0.5 s behind: within the 1 s limit
        assertThat(clock.running()).isTrue();
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L); // 100 ms wall at rate 40
        pacing.onStep(1_500_000_000L); // 1.5 s behind: the clock is held
        wall.advanceMillis(50);
        assertThat(clock.running()).isFalse();
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L); // stands still while held
        pacing.onStep(600_000_000L);
        assertThat(clock.running()).isFalse();
        pacing.onStep(10_000_000L); // within one step of the clock: caught up
        assertThat(clock.running()).isTrue();
        // 1.5 s caught up in 50 ms of wall time = 30x, less than twice the rate: the loop cannot keep 40x
        assertThat(clock.currentRate()).isEqualTo(32.0); // 40 × 0.8
        assertThat(journal).singleElement().satisfies(e -> {
            assertThat(e).containsEntry("event", "paceSlowed").containsEntry("fromRate", 40.0).containsEntry("toRate", 32.0)
                    .containsEntry("behindS", 1.5).containsEntry("heldWallMs", 50.0).containsEntry("limitS", 1.0)
                    .containsEntry("catchUpRate", 30.0);
            assertThat((Double) e.get("atS")).isEqualTo(4.0);
        });
        wall.advanceMillis(1_000);
        assertThat(clock.monotonicNanos()).isEqualTo(36_000_000_000L); // 4 s + 1 s wall at rate 32
        pacing.onStep(0);
        assertThat(clock.currentRate()).isEqualTo(32.0); // not calm for 5 wall seconds yet
        wall.advanceMillis(4_000);
        pacing.onStep(0);
        assertThat(clock.currentRate()).isEqualTo(40.0); // calm for 5 s: back to the asked rate (32 / 0.8)
        assertThat(journal.get(1)).containsEntry("event", "paceRaised").containsEntry("fromRate", 32.0)
                .containsEntry("toRate", 40.0);
        wall.advanceMillis(10_000);
        pacing.onStep(0);
        assertThat(clock.currentRate()).isEqualTo(40.0); // never above the asked rate
        assertThat(journal).hasSize(2);
    }

    @Test
    void shouldKeepTheRateAfterAHoldWhenThePhysicsCaughtUpFast() {
        wall.advanceMillis(100);
        pacing.onStep(3_000_000_000L); // 3 s behind: held
        wall.advanceMillis(10);
        pacing.onStep(5_000_000L); // caught up 3 s in 10 ms = 300x, well above twice the rate: a one-off hold-up
        assertThat(clock.running()).isTrue();
        assertThat(clock.currentRate()).isEqualTo(40.0);
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("event", "paceHeld")
                .containsEntry("toRate", 40.0).containsEntry("catchUpRate", 300.0).containsEntry("heldWallMs", 10.0));
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(8_000_000_000L); // 4 s, held 10 ms, then 100 ms at 40x
        pacing.finish(8.0);
        assertThat(journal.get(1)).containsEntry("holds", 1L).containsEntry("slowdowns", 0L);
    }

    @Test
    void shouldHoldTheClockAtTheLeashDuringAStallAndRunOnFromThereAtTheSameRateAfterAFastCatchUp() {
        // the physics keeps pace for 2 s of wall (80 scenario s at 40x), step by step
        for (int i = 0; i < 100; i++) {
            wall.advanceMillis(20);
            clock.physicsAt(clock.monotonicNanos());
            pacing.onStep(0);
        }
        assertThat(clock.monotonicNanos()).isEqualTo(80_000_000_000L);
        // a stall of 600 wall ms (a GC pause): unleashed the clock would read 104 s, the physics stands at 80 s
        wall.advanceMillis(600);
        assertThat(clock.monotonicNanos()).isEqualTo(81_000_000_000L); // physics + the 1 s limit
        assertThat(clock.running()).isFalse();
        assertThat(clock.leashHolds()).isEqualTo(1);
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(81_000_000_000L); // stands still, never beyond
        // the loop steps again: 1 s to catch up, in 50 steps of 20 ms over 5 ms of wall
        long physics = 80_000_000_000L;
        for (int i = 0; i < 50; i++) {
            physics += 20_000_000L;
            if (i % 10 == 9) {
                wall.advanceMillis(1);
            }
            clock.physicsAt(physics);
            pacing.onStep(81_000_000_000L - physics); // how late this step ran against the clock standing at 81 s
        }
        assertThat(clock.running()).isTrue();
        assertThat(clock.currentRate()).isEqualTo(40.0); // 1 s caught up in 5 ms: a one-off stall, the rate is kept
        long resumedAt = clock.monotonicNanos();
        assertThat(resumedAt).isEqualTo(81_000_000_000L); // runs on from where it stood: no jump
        wall.advanceMillis(10);
        assertThat(clock.monotonicNanos()).isEqualTo(81_400_000_000L); // then at 40x
        assertThat(journal).singleElement().satisfies(e -> {
            assertThat(e).containsEntry("event", "paceSlipped").containsEntry("fromRate", 40.0).containsEntry("toRate", 40.0)
                    .containsEntry("limitS", 1.0).containsEntry("atS", 81.0)
                    // the clock reached the leash 25 ms into the stall (1 s at 40x) and stood until the catch-up: 680 ms
                    .containsEntry("stallWallMs", 680.0).containsEntry("notRunS", 27.2)
                    .containsEntry("behindS", 0.98).containsEntry("catchUpRate", 196.0); // 0.98 s in 5 ms
        });
        pacing.finish(81.4);
        assertThat(journal.get(1)).containsEntry("slips", 1L).containsEntry("slipWallMs", 680.0)
                .containsEntry("notRunS", 27.2).containsEntry("slowdowns", 0L).containsEntry("holds", 0L);
        assertThat(pacing.describe(81.4)).contains("slipped 1 times (stalls 680 ms in all, 27.2 s of scenario not run)");
    }

    @Test
    void shouldSlowTheRateAfterASlipWhenTheLoopCaughtUpSlowerThanTwiceTheRate() {
        wall.advanceMillis(100);
        clock.physicsAt(3_000_000_000L); // the loop trails: the physics at 3 s when the clock reads 4 s
        pacing.onStep(980_000_000L);
        wall.advanceMillis(30); // the clock would read 5.2 s: it holds at 4 s, reached at 100 ms
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L);
        clock.physicsAt(3_020_000_000L);
        pacing.onStep(960_000_000L);
        wall.advanceMillis(40); // 1 s caught up over 40 ms of wall: 25x, below twice the rate
        clock.physicsAt(4_000_000_000L);
        pacing.onStep(0);
        assertThat(clock.running()).isTrue();
        assertThat(clock.currentRate()).isEqualTo(32.0);
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("event", "paceSlipped")
                .containsEntry("toRate", 32.0).containsEntry("stallWallMs", 70.0).containsEntry("catchUpRate", 24.0)); // 0.96 s in 40 ms
        wall.advanceMillis(100);
        clock.physicsAt(7_000_000_000L); // the physics keeps up with the slower clock
        assertThat(clock.monotonicNanos()).isEqualTo(7_200_000_000L); // 4 s + 100 ms at 32x
        pacing.finish(7.2);
        assertThat(journal.get(1)).containsEntry("slips", 1L).containsEntry("slowdowns", 1L).containsEntry("lowestRate", 32.0);
    }

    @Test
    void shouldNeverReadMoreThanTheLeashAheadOfThePhysicsNorGoBack() {
        long physics = 0;
        long last = 0;
        for (int i = 0; i < 40; i++) {
            wall.advanceMillis(7);
            physics += 210_000_000L; // the loop keeps 30x of the 40x asked: the clock gains 70 ms a pass
            clock.physicsAt(physics);
            long n = clock.monotonicNanos();
            assertThat(n).isGreaterThanOrEqualTo(last).isLessThanOrEqualTo(physics + 1_000_000_000L);
            last = n;
        }
        // it reached the leash on the 15th pass (15 × 70 ms > 1 s) and stands there until a pace keeper lets it run
        assertThat(clock.leashHolds()).isEqualTo(1);
        assertThat(last).isEqualTo(15 * 210_000_000L + 1_000_000_000L);
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> clock.leashTo(0))
                .hasMessageContaining("leash must be a positive number");
    }

    @Test
    void shouldSayRateNotKeptOnlyBeyondTheFactor() {
        wall.advanceMillis(10_000);
        // 390 scenario s in 10 wall s = 39x kept of 40x asked: 40 / 39 = 1.026 ≤ 1.1
        assertThat(pacing.finish(390)).isEmpty();
        assertThat(journal.get(0)).containsEntry("event", "paceSummary").containsEntry("rateKept", true)
                .containsEntry("askedRate", 40.0);
        assertThat((Double) journal.get(0).get("keptRate")).isCloseTo(39.0, within(1e-9));
        // 300 scenario s in 10 wall s = 30x: 40 / 30 = 1.33 > 1.1
        Optional<String> line = pacing.finish(300);
        assertThat(line).hasValueSatisfying(l -> assertThat(l).startsWith("RATE NOT KEPT: asked 40x, kept 30.0x over 10.0 s wall"));
        assertThat(journal.get(1)).containsEntry("rateKept", false);
    }

    @Test
    void shouldLeaveTheClockAloneForOldCommandsWhenTheWatchIsOff() {
        pacing.watchCommandsBeyond(0);
        wall.advanceMillis(2_000);
        long now = clock.epochMillis();
        pacing.onCommandArrived(pulse(1, now - 3_900, now + 100), clock.monotonicNanos()); // 97.5 % of 4 s gone
        assertThat(clock.currentRate()).isEqualTo(40.0);
        assertThat(journal).isEmpty();
    }

    @Test
    void shouldCutTheRateInProportionWhenCommandsArriveOlderThanHalfTheirValidityAsByDefault() {
        wall.advanceMillis(2_000); // 80 s of scenario time at 40x
        long now = clock.epochMillis();
        // issued 1.9 s before it arrived, valid 4 s: 47.5 % gone on the way, the path keeps up
        pacing.onCommandArrived(pulse(1, now - 1_900, now + 2_100), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(40.0);
        assertThat(journal).isEmpty();
        // issued 3.2 s (80 ms of wall time at 40x) before it arrived: 80 % gone; the same 80 ms at 12.5x
        // are 1 s, half the 2 s limit: 40 × 1 / 3.2
        long arrivedNanos = clock.monotonicNanos();
        wall.advanceMillis(5); // taken off the queue 5 ms later: the plant's own wait is not the path's
        pacing.onCommandArrived(pulse(2, now - 3_200, now + 800), arrivedNanos);
        assertThat(clock.currentRate()).isEqualTo(12.5);
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("event", "paceSlowed")
                .containsEntry("reason", "commandPath").containsEntry("commandAgeS", 3.2).containsEntry("validityS", 4.0)
                .containsEntry("limitS", 2.0).containsEntry("fromRate", 40.0).containsEntry("toRate", 12.5)
                .containsEntry("unit", "basin-steam-1").containsEntry("commandSeq", 2L));
        // the same hold-up's next old command, 0.5 wall s later: no second slow-down
        wall.advanceMillis(500);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(3, now - 3_000, now + 1_000), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(12.5);
        // 1.1 wall s after the change the path is still slow (2.2 s old): 12.5 × 1 / 2.2 = 5.68
        wall.advanceMillis(600);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(4, now - 2_200, now + 1_800), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(5.68);
        // the path answered the cut (1.9 s, under 0.9 × 2.2 s), and 1.9 s is under the 2 s limit: no cut
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(5, now - 1_900, now + 2_100), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(5.68);
        // 5 s old (expired) at 5.68x: the proportional 1.14x is below the deepest cut, a quarter of the rate
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(6, now - 5_000, now - 1_000), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(1.42);
        // just over the limit (2.2 s at 1.42x): 1.42 × 1 / 2.2 = 0.65, but never below real time for the path
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(7, now - 2_200, now + 1_800), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(PlantPacing.COMMAND_PATH_FLOOR_RATE);
        // at real time, a command still too old slows nothing further
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(8, now - 1_900, now + 2_100), clock.monotonicNanos());
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(9, now - 3_000, now + 1_000), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(1.0);
        pacing.finish(100);
        assertThat(journal.get(4)).containsEntry("event", "paceSummary").containsEntry("slowdowns", 4L)
                .containsEntry("commandPathSlowdowns", 4L).containsEntry("maxCommandAgeS", 5.0)
                .containsEntry("lowestRate", 1.0).containsEntry("commandPathWatchStopped", false);
    }

    /**
     * A controller that stamps its commands 20 s in the past (its clock behind the plant's): slowing the clock does
     * not make them younger, so after one cut and the commands' non-answer the rate goes back and the watch stops;
     * the commands are judged as they are (refused as expired), not waited for at an ever lower rate.
     */
    @Test
    void shouldGoBackToTheRateAndStopWatchingWhenTheCommandsAgeDoesNotFollowTheRate() {
        wall.advanceMillis(2_000);
        long now = clock.epochMillis();
        // valid 8 s, limit 4 s: 40 × 2 / 20 = 4, below the deepest cut, a quarter of 40
        pacing.onCommandArrived(pulse(1, now - 20_000, now - 12_000), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(10.0);
        long seq = 2;
        for (int wallMs : new int[] {500, 600, 400, 500, 200}) { // 1.1, 1.5, 2.0 (span 0.9 s) and 2.2 s after the cut
            wall.advanceMillis(wallMs);
            now = clock.epochMillis();
            pacing.onCommandArrived(pulse(seq++, now - 20_000, now - 12_000), clock.monotonicNanos());
            assertThat(clock.currentRate()).as("at command " + (seq - 1)).isEqualTo(seq <= 6 ? 10.0 : 40.0);
        }
        assertThat(journal).hasSize(2);
        assertThat(journal.get(1)).containsEntry("event", "paceWatchStopped").containsEntry("reason", "ageNotFromPath")
                .containsEntry("fromRate", 10.0).containsEntry("toRate", 40.0).containsEntry("cutAgeS", 20.0)
                .containsEntry("cutFromRate", 40.0).containsEntry("cutToRate", 10.0).containsEntry("youngestAgeAfterS", 20.0)
                .containsEntry("commandsAfter", 4);
        wall.advanceMillis(2_000);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(seq, now - 20_000, now - 12_000), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(40.0);
        pacing.finish(100);
        assertThat(journal.get(2)).containsEntry("event", "paceSummary").containsEntry("commandPathSlowdowns", 1L)
                .containsEntry("commandPathWatchStopped", true);
    }

    /** One hold-up delays a burst of commands: all old at one instant is no proof that the age is in their stamps. */
    @Test
    void shouldNotTakeOneBurstOfOldCommandsForStampedAge() {
        wall.advanceMillis(2_000);
        long now = clock.epochMillis();
        pacing.onCommandArrived(pulse(1, now - 3_200, now + 800), clock.monotonicNanos());
        assertThat(clock.currentRate()).isEqualTo(12.5);
        wall.advanceMillis(1_200);
        now = clock.epochMillis();
        for (long seq = 2; seq <= 5; seq++) { // four commands held up together, as old as the one that made the cut
            pacing.onCommandArrived(pulse(seq, now - 3_200, now + 800), clock.monotonicNanos());
        }
        assertThat(clock.currentRate()).isEqualTo(12.5);
        wall.advanceMillis(300);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(6, now - 500, now + 3_500), clock.monotonicNanos()); // the path answers
        wall.advanceMillis(1_100);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(7, now - 2_500, now + 1_500), clock.monotonicNanos()); // a new hold-up: cut again
        assertThat(clock.currentRate()).isEqualTo(5.0); // 12.5 × 1 / 2.5
        assertThat(journal).extracting(e -> e.get("event")).containsExactly("paceSlowed", "paceSlowed");
    }

    @Test
    void shouldNotRaiseTheRateWhileCommandsStillArriveOlderThanHalfTheLimit() {
        wall.advanceMillis(2_000);
        long now = clock.epochMillis();
        pacing.onCommandArrived(pulse(1, now - 2_500, now + 1_500), clock.monotonicNanos()); // 62.5 % gone
        assertThat(clock.currentRate()).isEqualTo(16.0); // 40 × 1 / 2.5
        wall.advanceMillis(4_000);
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(2, now - 1_400, now + 2_600), clock.monotonicNanos()); // 1.4 s: under 2 s, over 1 s
        assertThat(clock.currentRate()).isEqualTo(16.0);
        wall.advanceMillis(1_500); // 5.5 s after the cut, 1.5 s after the strained command
        pacing.onStep(0);
        assertThat(clock.currentRate()).isEqualTo(16.0);
        wall.advanceMillis(3_600); // 5.1 s after the last strained command
        now = clock.epochMillis();
        pacing.onCommandArrived(pulse(3, now - 600, now + 3_400), clock.monotonicNanos()); // 0.6 s: calm
        pacing.onStep(0);
        assertThat(clock.currentRate()).isEqualTo(20.0); // 16 / 0.8
        assertThat(journal.get(1)).containsEntry("event", "paceRaised");
    }

    @Test
    void shouldTakeTheCommandAgeShareAsGiven() {
        pacing.watchCommandsBeyond(0.8);
        wall.advanceMillis(2_000);
        long now = clock.epochMillis();
        pacing.onCommandArrived(pulse(1, now - 3_000, now + 1_000), clock.monotonicNanos()); // 75 % of 4 s gone
        assertThat(clock.currentRate()).isEqualTo(40.0);
        pacing.onCommandArrived(pulse(2, now - 3_500, now + 500), clock.monotonicNanos()); // 87.5 % gone
        assertThat(clock.currentRate()).isEqualTo(18.29); // 40 × 1.6 / 3.5
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("limitS", 3.2));
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> pacing.watchCommandsBeyond(1.5))
                .hasMessageContaining("command age share");
    }

    static UnitCommand pulse(long seq, long issuedAtMs, long validUntilMs) {
        return UnitCommand.pulse(seq, issuedAtMs, "basin-steam-1", "controller-1", 0, validUntilMs, PulseDirection.RAISE,
                2_000);
    }

    @Test
    void shouldRefuseSettingsOutsideTheirRange() {
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new PacingSettings(0, 1.1, 0.8, 5))
                .hasMessageContaining("pace lag");
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new PacingSettings(1, 0.9, 0.8, 5))
                .hasMessageContaining("pace factor");
    }
}
