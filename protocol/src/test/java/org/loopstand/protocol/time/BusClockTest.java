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
        wall.advanceMillis(250); // a quarter wall second at rate 20 = 5 scenario seconds
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 5_000);
        clock.onTick(tick(2, SCENARIO_MS + 20_000, 20, true));
        wall.advanceMillis(100);
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 22_000);
        assertThat(clock.rate()).isEqualTo(20);
    }

    @Test
    void shouldNeverRunBackwardsWhenATickIsBehindTheExtrapolation() {
        clock.onTick(tick(1, SCENARIO_MS, 10, true));
        wall.advanceMillis(1_000);
        long ahead = clock.monotonicNanos(); // 10 s extrapolated
        clock.onTick(tick(2, SCENARIO_MS + 9_000, 10, true)); // the plant only got to 9 s
        assertThat(clock.monotonicNanos()).isEqualTo(ahead);
        wall.advanceMillis(50); // 9.5 s: still behind, time holds
        assertThat(clock.monotonicNanos()).isEqualTo(ahead);
        wall.advanceMillis(150); // 11 s: moves on from the new anchor
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 11_000);
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
        wall.advanceMillis(60_000); // 600 s of scenario time at rate 10
        long monotonicBefore = clock.monotonicNanos();
        assertThat(clock.epochMillis()).isEqualTo(SCENARIO_MS + 600_000);
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
}
