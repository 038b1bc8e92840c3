package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.time.VirtualClock;

/** The clock held for a late controller status, within a wall bound, over a hand-advanced wall clock. */
class HeartbeatPacingTest {
    final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    final HeldStartClock clock = new HeldStartClock(wall, 40);
    final List<Map<String, Object>> journal = new ArrayList<>();
    /** scenario ns of the last controller status the units took; -1 = no unit armed in remote */
    long lastStatusNanos = 0;
    final HeartbeatPacing pacing = new HeartbeatPacing(clock, wall,
            now -> lastStatusNanos < 0 ? -1 : now - lastStatusNanos, 15_000_000_000L, 2_000_000_000L, journal::add);

    {
        clock.release();
    }

    @Test
    void shouldHoldTheClockWhileTheStatusIsLateAndRunOnAsSoonAsItCame() {
        wall.advanceMillis(300); // 12 s of scenario time since the status at 0: within half the 30 s watchdog
        pacing.onCycle();
        assertThat(clock.running()).isTrue();
        wall.advanceMillis(100); // 16 s: late, the controller process was not scheduled
        pacing.onCycle();
        assertThat(clock.running()).isFalse();
        long heldAt = clock.monotonicNanos();
        assertThat(heldAt).isEqualTo(16_000_000_000L);
        wall.advanceMillis(700); // unheld, the watchdog (30 s) would have fired by now
        pacing.onCycle();
        assertThat(clock.monotonicNanos()).isEqualTo(heldAt);
        lastStatusNanos = heldAt; // the status came
        pacing.onCycle();
        assertThat(clock.running()).isTrue();
        assertThat(clock.currentRate()).isEqualTo(40.0);
        wall.advanceMillis(10);
        assertThat(clock.monotonicNanos()).isEqualTo(16_400_000_000L); // from where it stood, at 40x
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("event", "paceHeld")
                .containsEntry("reason", "controllerLate").containsEntry("statusAgeS", 16.0).containsEntry("limitS", 15.0)
                .containsEntry("heldWallMs", 700.0).containsEntry("statusCame", true).containsEntry("atS", 16.0));
        assertThat(pacing.describe()).startsWith("clock held 1 times for a late controller status (700 ms in all");
    }

    @Test
    void shouldLetAControllerThatIsGoneMeetTheWatchdogAfterTheBound() {
        wall.advanceMillis(400); // 16 s late: held
        pacing.onCycle();
        wall.advanceMillis(2_000); // no status within the 2 s bound: runs on
        pacing.onCycle();
        assertThat(clock.running()).isTrue();
        assertThat(journal).singleElement().satisfies(e -> assertThat(e).containsEntry("statusCame", false)
                .containsEntry("heldWallMs", 2000.0));
        wall.advanceMillis(500); // still no status: not held again
        pacing.onCycle();
        assertThat(clock.running()).isTrue();
        assertThat(clock.monotonicNanos()).isEqualTo(36_000_000_000L); // 16 s + 500 ms at 40x: past the watchdog
        lastStatusNanos = -1; // the units left remote: nothing to wait for
        pacing.onCycle();
        lastStatusNanos = clock.monotonicNanos(); // back in remote later with a fresh status
        wall.advanceMillis(400);
        pacing.onCycle();
        assertThat(clock.running()).isFalse(); // a fresh status arms the hold again
    }
}
