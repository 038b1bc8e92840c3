package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class AceStatisticsTest {
    @Test
    void shouldMatchAHandWorkedRecord() {
        // ACE every 4 s: −5, 15, 30, −60, 0 MW.
        AceStatistics s = AceStatistics.of(Series.of("MW", Series.T0_MS, 0, -5, 4, 15, 8, 30, 12, -60, 16, 0),
                new double[] {10, 50});
        // mean = (−5 + 15 + 30 − 60 + 0) / 5 = −20 / 5 = −4 MW
        assertThat(s.meanMw()).isCloseTo(-4.0, within(1e-12));
        // deviations −1, 19, 34, −56, 4 → squares 1 + 361 + 1156 + 3136 + 16 = 4670; σ = √(4670/5) = √934 = 30.5614 MW
        assertThat(s.sigmaMw()).isCloseTo(30.56141, within(1e-5));
        // |ACE| sorted 0, 5, 15, 30, 60: p50 rank ⌈2.5⌉ = 3 → 15; p90 rank ⌈4.5⌉ = 5 → 60; p99 → 60
        assertThat(s.p50AbsMw()).isEqualTo(15);
        assertThat(s.p90AbsMw()).isEqualTo(60);
        assertThat(s.p99AbsMw()).isEqualTo(60);
        assertThat(s.maxAbsMw()).isEqualTo(60);
        // Zero-order hold, 4 s per sample, last sample 0 s:
        // [0,10): −5 → 4 s (the final 0 holds no time); [10,50): 15, 30 → 8 s; [50,∞): −60 → 4 s
        assertThat(s.timeInBandS()).extracting(AceStatistics.Band::durationS).containsExactly(4.0, 8.0, 4.0);
        assertThat(s.timeInBandS().get(2).upperAbsMw()).isInfinite();
    }
}
