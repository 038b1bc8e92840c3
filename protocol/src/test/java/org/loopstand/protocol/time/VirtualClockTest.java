package org.loopstand.protocol.time;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;

class VirtualClockTest {
    @Test
    void shouldAdvanceOnlyWhenTold() {
        VirtualClock clock = new VirtualClock(1_700_000_000_000L);
        assertThat(clock.epochMillis()).isEqualTo(1_700_000_000_000L);
        clock.advanceMillis(2_500);
        assertThat(clock.epochMillis()).isEqualTo(1_700_000_002_500L);
        assertThat(clock.monotonicNanos()).isEqualTo(2_500_000_000L);
        assertThat(clock.elapsedSeconds()).isEqualTo(2.5);
    }

    @Test
    void shouldRefuseToGoBackwards() {
        VirtualClock clock = new VirtualClock(0);
        assertThatThrownBy(() -> clock.advanceNanos(-1)).hasMessageContaining("backwards");
    }

    @Test
    void shouldRunAcceleratedClockAtItsRate() {
        VirtualClock wall = new VirtualClock(0);
        AcceleratedClock fast = new AcceleratedClock(wall, 20.0, 1_000_000L);
        wall.advanceMillis(500);
        assertThat(fast.monotonicNanos()).isEqualTo(10_000_000_000L);
        assertThat(fast.epochMillis()).isEqualTo(1_010_000L);
        assertThat(fast.wallNanosFor(4_000_000_000L)).isEqualTo(200_000_000L);
        assertThatThrownBy(() -> new AcceleratedClock(wall, 0, 0)).hasMessageContaining("rate");
    }
}
