package org.loopstand.controller.cycle;

import static org.assertj.core.api.Assertions.assertThat;

import org.HdrHistogram.Histogram;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.time.VirtualClock;

class CycleSchedulerTest {
    private static final long PERIOD_NS = 4_000_000_000L;

    @Test
    void shouldNotDriftOverTenThousandCycles() {
        VirtualClock clock = new VirtualClock(1_700_000_000_000L);
        CycleScheduler s = new CycleScheduler(clock, PERIOD_NS, 0);
        long lastNumber = -1;
        for (int i = 0; i < 10_000; i++) {
            clock.advanceNanos(s.nanosUntilNext());
            // each cycle wakes 1..7 ms late and then works 0..300 ms: neither may shift later starts
            long lateNs = 1_000_000L + (i * 7919L % 6) * 1_000_000L;
            clock.advanceNanos(lateNs);
            CycleTick t = s.poll().orElseThrow();
            assertThat(t.scheduledStartNanos()).isEqualTo(t.cycleNumber() * PERIOD_NS);
            assertThat(t.jitterNanos()).isEqualTo(lateNs);
            assertThat(t.cycleNumber()).isEqualTo(lastNumber + 1);
            lastNumber = t.cycleNumber();
            clock.advanceNanos((i % 4) * 100_000_000L);
            assertThat(s.poll()).isEmpty();
        }
        assertThat(s.nextStartNanos()).isEqualTo(10_000 * PERIOD_NS);
        assertThat(s.cyclesMissed()).isZero();
        Histogram h = s.takeJitterHistogram();
        assertThat(h.getTotalCount()).isEqualTo(10_000);
        assertThat(h.getMaxValue()).isBetween(6_000_000L, 6_010_000L);
    }

    @Test
    void shouldSkipAndCountMissedCycles() {
        VirtualClock clock = new VirtualClock(0);
        CycleScheduler s = new CycleScheduler(clock, PERIOD_NS, 0);
        s.poll().orElseThrow();
        clock.advanceNanos(3 * PERIOD_NS + 500_000_000L);
        CycleTick t = s.poll().orElseThrow();
        assertThat(t.cycleNumber()).isEqualTo(3);
        assertThat(t.missedBefore()).isEqualTo(2);
        assertThat(t.jitterNanos()).isEqualTo(500_000_000L);
        assertThat(s.cyclesMissed()).isEqualTo(2);
        assertThat(s.nextStartNanos()).isEqualTo(4 * PERIOD_NS);
    }

    @Test
    void shouldAlignFirstCycleToPeriod() {
        VirtualClock clock = new VirtualClock(0);
        clock.advanceNanos(5_300_000_000L);
        CycleScheduler s = CycleScheduler.alignedTo(clock, PERIOD_NS);
        assertThat(s.nextStartNanos()).isEqualTo(8_000_000_000L);
        assertThat(s.poll()).isEmpty();
        assertThat(s.nanosUntilNext()).isEqualTo(2_700_000_000L);
    }
}
