package org.loopstand.protocol.time;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.message.ClockTick;

/** A silent time source named in the journal and the status, a stall of the plant not. */
class ClockSilenceWatchTest {
    private static final long SCENARIO_MS = 1_800_000_000_000L;
    private final VirtualClock wall = new VirtualClock(1_700_000_000_000L);
    private final BusClock clock = new BusClock(wall);
    private final List<Map<String, Object>> events = new ArrayList<>();
    private final ClockSilenceWatch watch = new ClockSilenceWatch(clock, events::add);

    private static ClockTick tick(long seq, long scenarioEpochMs, double rate) {
        return new ClockTick(seq, scenarioEpochMs, scenarioEpochMs - SCENARIO_MS, rate, true);
    }

    @Test
    void shouldNameASilenceWithItsFiguresAndItsEndButNotAStall() {
        clock.onTick(tick(1, SCENARIO_MS, 20));
        wall.advanceMillis(600); // a stall of the plant: time stands still, nothing named
        assertThat(watch.poll()).isZero();
        assertThat(watch.withSilence(List.of("frequencyUnusable:north"))).containsExactly("frequencyUnusable:north");
        wall.advanceMillis(1_900); // 2.5 s of wall without a tick: silent
        assertThat(watch.poll()).isEqualTo(1);
        assertThat(watch.poll()).isZero(); // named once
        assertThat(events).singleElement().satisfies(e -> assertThat(e).containsEntry("event", "clockSilent")
                .containsEntry("silentWallMs", 2_500L).containsEntry("limitWallMs", 2_000L)
                .containsEntry("lastTickAtMs", SCENARIO_MS).containsEntry("lastTickRate", 20.0));
        assertThat(watch.withSilence(List.of("frequencyUnusable:north")))
                .containsExactly("frequencyUnusable:north", "clockSilent");
        wall.advanceMillis(500);
        clock.onTick(tick(2, SCENARIO_MS + 60_000, 20));
        assertThat(watch.poll()).isEqualTo(1);
        assertThat(events.get(1)).containsEntry("event", "clockHeard").containsEntry("silentWallMs", 3_000L)
                .containsEntry("silenceJournaled", true);
        assertThat(watch.silent()).isFalse();
        assertThat(watch.withSilence(List.of())).isEmpty();
    }
}
