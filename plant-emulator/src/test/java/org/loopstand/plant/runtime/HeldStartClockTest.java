package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Named holds on the scenario clock at rate 40 over a hand-advanced wall clock: the clock runs only while no
 * hold is in force, each holder lets go of its own (a hold is released by whoever took it: common practice,
 * no source).
 */
class HeldStartClockTest {
    final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    final HeldStartClock clock = new HeldStartClock(wall, 40);

    @Test
    void shouldRunOnlyOnceEveryHolderHasLetGo() {
        clock.release();
        wall.advanceMillis(100); // 4 s
        clock.hold(PlantPacing.HOLD);
        clock.hold(HeartbeatPacing.HOLD);
        wall.advanceMillis(100);
        clock.letGo(PlantPacing.HOLD); // the physics caught up, the controller's status is still late
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L);
        assertThat(clock.running()).isFalse();
        assertThat(clock.holdsInForce()).containsExactly(HeartbeatPacing.HOLD);
        clock.letGo(HeartbeatPacing.HOLD); // the status came
        wall.advanceMillis(50);
        assertThat(clock.monotonicNanos()).isEqualTo(6_000_000_000L); // from where it stood: 50 ms at 40x
        assertThat(clock.holdsInForce()).isEmpty();
    }

    @Test
    void shouldTakeARateSetWhileHeldFromTheEndOfTheLastHold() {
        clock.release();
        wall.advanceMillis(100);
        clock.hold(HeartbeatPacing.HOLD);
        clock.runAt(20); // the pace keeper slows the clock while another holds it: no hold is lifted
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L);
        clock.letGo(HeartbeatPacing.HOLD);
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(6_000_000_000L); // 100 ms at 20x
        assertThat(clock.currentRate()).isEqualTo(20.0);
    }

    @Test
    void shouldKeepTheLeashHoldUntilItIsLetGoOfByName() {
        clock.leashTo(1_000_000_000L);
        clock.release();
        clock.physicsAt(2_000_000_000L);
        wall.advanceMillis(100); // 4 s read: past the physics + 1 s, held at 3 s
        assertThat(clock.monotonicNanos()).isEqualTo(3_000_000_000L);
        assertThat(clock.holdsInForce()).containsExactly(HeldStartClock.LEASH);
        assertThat(clock.heldBy(HeldStartClock.LEASH)).isTrue();
        clock.letGo(HeartbeatPacing.HOLD); // a holder that held nothing lifts nothing
        clock.physicsAt(3_000_000_000L);
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(3_000_000_000L);
        clock.letGo(HeldStartClock.LEASH); // the pace keeper: the physics caught up
        wall.advanceMillis(10);
        assertThat(clock.monotonicNanos()).isEqualTo(3_400_000_000L);
        assertThat(clock.leashHolds()).isEqualTo(1);
    }

    @Test
    void shouldKeepAHoldTakenBeforeTheReleaseAndRefuseAHoldWithoutAName() {
        clock.hold(HeartbeatPacing.HOLD);
        clock.release();
        wall.advanceMillis(100);
        assertThat(clock.released()).isTrue();
        assertThat(clock.monotonicNanos()).isZero();
        clock.letGo(HeartbeatPacing.HOLD);
        wall.advanceMillis(100);
        assertThat(clock.monotonicNanos()).isEqualTo(4_000_000_000L);
        assertThatThrownBy(() -> clock.hold("")).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("a hold needs a name of its own");
        assertThatThrownBy(() -> clock.hold(HeldStartClock.LEASH)).isInstanceOf(IllegalArgumentException.class);
    }
}
