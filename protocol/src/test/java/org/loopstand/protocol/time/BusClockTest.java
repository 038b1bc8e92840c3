package org.loopstand.protocol.time;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.ClockTick;

/** {@code --clock bus}: scenario time from the plant's clock ticks, extrapolated at their rate. */
class BusClockTest {
    private static final long SCENARIO_MS = 1_800_000_000_000L;
    private final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    private final BusClock clock = new BusClock(wall);

    private static ClockTick tick(long seq, long scenarioEpochMs, double rate, boolean running) {
        return new ClockTick(seq, scenarioEpochMs, scenarioEpochMs - SCENARIO_MS, rate, running);
    }

    @Test
    void shouldKnowNoTimeBeforeTheFirstTick() {
        assertThat(clock.synced()).isFalse();
        assertThat(clock.rate()).isZero();
        assertThat(clock.monotonicNanos()).isZero();
    }

    @Test
    void shouldExtrapolateBetweenTicksAtTheTickRate() {
        clock.onTick(tick(1, SCENARIO_MS, 20, true));
        assertThat(clock.synced()).isTrue();
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS);
        wall.advanceMillis(75); // 75 ms of wall at rate 20 = 1.5 scenario seconds (ticks come every 50 ms)
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 1_500);
        clock.onTick(tick(2, SCENARIO_MS + 20_000, 20, true));
        wall.advanceMillis(100);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 22_000);
        assertThat(clock.rate()).isEqualTo(20);
    }

    @Test
    void shouldNeverRunBackwardsWhenATickIsBehindTheExtrapolation() {
        clock.onTick(tick(1, SCENARIO_MS, 10, true));
        wall.advanceMillis(150);
        long ahead = clock.monotonicNanos(); // 1.5 s extrapolated
        clock.onTick(tick(2, SCENARIO_MS + 1_000, 10, true)); // the plant only got to 1 s
        assertThat(clock.monotonicNanos()).isEqualTo(ahead);
        wall.advanceMillis(25); // 1.25 s: still behind, time holds
        assertThat(clock.monotonicNanos()).isEqualTo(ahead);
        wall.advanceMillis(35); // 1.6 s: moves on from the new anchor
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 1_600);
    }

    @Test
    void shouldHoldTimeWhileTheScenarioIsStopped() {
        clock.onTick(tick(1, SCENARIO_MS + 3_000, 5, false));
        wall.advanceMillis(10_000);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 3_000);
        assertThat(clock.rate()).isZero();
    }

    @Test
    void shouldFollowARestartedPlantsClockBackWhileMonotonicTimeRunsOn() {
        clock.onTick(tick(1, SCENARIO_MS, 10, true));
        wall.advanceMillis(60_000); // no tick for a wall minute: 2 s extrapolated, then silent after 2 s, blind for 58 s
        long monotonicBefore = clock.monotonicNanos();
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 582_000);
        // the plant restarted: its scenario clock starts again from its new start
        clock.onTick(tick(1, SCENARIO_MS + 30_000, 10, true));
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 30_000);
        assertThat(clock.monotonicNanos()).isGreaterThanOrEqualTo(monotonicBefore);
        assertThat(clock.monotonicNanos() % 1_000_000_000L).isEqualTo(monotonicBefore % 1_000_000_000L);
        wall.advanceMillis(100);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 31_000);
        assertThat(clock.restartsFollowed()).isEqualTo(1);
    }

    @Test
    void shouldIgnoreOldTicksDeliveredLateAfterAPartitionRatherThanTakeThemForARestart() {
        clock.onTick(tick(1_000, SCENARIO_MS, 20, true));
        wall.advanceMillis(4_000); // 80 s of scenario time at rate 20, the ticks of the last 80 s queued at a broker
        clock.onTick(tick(1_090, SCENARIO_MS + 80_000, 20, true));
        clock.onTick(tick(1_010, SCENARIO_MS + 10_000, 20, true)); // the queue empties after the heal
        clock.onTick(tick(1_011, SCENARIO_MS + 11_000, 20, true));

        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 80_000);
        assertThat(clock.restartsFollowed()).isZero();
        assertThat(clock.lateTicksIgnored()).isEqualTo(2);
    }

    @Test
    void shouldStandStillTwoTickPeriodsPastTheLastTickUntilTheSourceIsSilentThenRunOnBlindFromThere() {
        clock.onTick(tick(1, SCENARIO_MS, 40, true)); // at rate 40 the plant ticks every 25 ms of wall
        wall.advanceMillis(30);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 1_200);
        wall.advanceMillis(500); // the plant's loop stalls: no tick; the controller's time stands at 2 tick periods
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 2_000);
        assertThat(clock.silentWallNanos()).isZero();
        wall.advanceMillis(1_469); // 1999 ms without a tick: not yet silent
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 2_000);
        assertThat(clock.silentWallNanos()).isZero();
        wall.advanceMillis(101); // 2.1 s without a tick: silent, time runs on blind from where it stood, at 40x
        assertThat(clock.silentWallNanos()).isEqualTo(2_100_000_000L);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 6_000);
        clock.onTick(tick(2, SCENARIO_MS + 3_000, 40, true)); // the plant back, behind the blind time: time holds
        assertThat(clock.silentWallNanos()).isZero();
        assertThat(clock.silencesEnded()).isEqualTo(1);
        assertThat(clock.lastSilenceWallNanos()).isEqualTo(2_100_000_000L);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 6_000);
        assertThat(clock.restartsFollowed()).isZero();
    }

    @Test
    void shouldTakeTheSilenceLimitAsThreeTickPeriodsWhenLongerThanTwoSeconds() {
        assertThat(BusClock.silentAfterWallNanos(40)).isEqualTo(2_000_000_000L);
        assertThat(BusClock.silentAfterWallNanos(1)).isEqualTo(3_000_000_000L); // a tick every wall second
        assertThat(BusClock.silentAfterWallNanos(0.5)).isEqualTo(3_000_000_000L);
        assertThat(BusClock.tickPeriodWallNanos(40)).isEqualTo(25_000_000L);
    }

    @Test
    void shouldRunOnBlindAtOnceWhenItsOwnLinkIsDownAndWaitAgainOnceItIsBack() {
        clock.onTick(tick(1, SCENARIO_MS, 20, true)); // a tick every 50 ms of wall at rate 20
        wall.advanceMillis(300); // stands at 2 s
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 2_000);
        clock.linkUp(false); // the controller's broker connection dropped: no tick can come
        assertThat(clock.silentWallNanos()).isEqualTo(300_000_000L);
        wall.advanceMillis(500); // blind from where it stood, at 20x
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 12_000);
        clock.linkUp(true);
        clock.onTick(tick(2, SCENARIO_MS + 16_000, 20, true));
        assertThat(clock.silencesEnded()).isEqualTo(1);
        wall.advanceMillis(100);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 18_000);
        wall.advanceMillis(500); // link up: stands at two tick periods past the tick again
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 18_000);
        assertThat(clock.silentWallNanos()).isZero();
    }

    @Test
    void shouldStandStillWhileTheSourceIsSilentWhenToldToAndTakeThePlantsTimeFromTheNextTick() {
        BusClock unit = new BusClock(wall, BusClock.WhenSilent.STAND_STILL); // a unit interface's clock
        unit.onTick(tick(1, SCENARIO_MS, 20, true));
        wall.advanceMillis(3_500); // its connection stalled 3.5 s: blind at 20x would be 2 s + 1.5 s x 20 = 32 s on
        assertThat(unit.silentWallNanos()).isEqualTo(3_500_000_000L); // still named silent
        assertThat(unit.epochMillis()).isEqualTo(SCENARIO_MS + 2_000); // two tick periods past the tick, no further
        unit.onTick(tick(2, SCENARIO_MS + 70_000, 20, true)); // the plant ran on meanwhile: its time, at once
        assertThat(unit.epochMillis()).isEqualTo(SCENARIO_MS + 70_000);
        assertThat(unit.silencesEnded()).isEqualTo(1);
        assertThat(unit.restartsFollowed()).isZero();
        unit.linkUp(false); // its own link down: silent at once, and still standing
        wall.advanceMillis(1_000);
        assertThat(unit.silentWallNanos()).isPositive();
        assertThat(unit.epochMillis()).isEqualTo(SCENARIO_MS + 72_000);
    }

    @Test
    void shouldSayWhenItsTimeStandsWaitingForTheNextTick() {
        BusClock unit = new BusClock(wall, BusClock.WhenSilent.STAND_STILL);
        assertThat(unit.standing()).as("no time before the first tick").isTrue();
        unit.onTick(tick(1, SCENARIO_MS, 20, true));
        wall.advanceMillis(100); // two tick periods of extrapolation at rate 20
        assertThat(unit.standing()).isFalse();
        wall.advanceMillis(1);
        assertThat(unit.standing()).isTrue();
        wall.advanceMillis(5_000); // silent: still standing
        assertThat(unit.standing()).isTrue();
        unit.onTick(tick(2, SCENARIO_MS + 1_000, 20, false)); // the plant holds its clock: known, not waiting
        wall.advanceMillis(5_000);
        assertThat(unit.standing()).isFalse();

        clock.onTick(tick(1, SCENARIO_MS, 20, true)); // a controller's clock stands from the cap to the silence limit
        wall.advanceMillis(1_000);
        assertThat(clock.standing()).isTrue();
        wall.advanceMillis(1_001); // then runs on blind
        assertThat(clock.standing()).isFalse();
    }
}
