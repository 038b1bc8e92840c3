package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

/** 15-minute FRCE statistics, SOGL Annex III style (Commission Regulation (EU) 2017/1485, from memory). */
class FrceStatisticsTest {
    @Test
    void shouldAverageQuarterHoursAndCountThemOutsideTheRanges() {
        // Four quarter hours starting at a quarter-hour boundary, two samples each (s, MW):
        // Q1: 10, 30 → 20; Q2: −40, −60 → −50; Q3: 100, 140 → 120; Q4: 0, 10 → 5
        FrceStatistics s = FrceStatistics.of(Series.of("MW", Series.Q0_MS,
                0, 10, 600, 30,
                900, -40, 1500, -60,
                1800, 100, 2400, 140,
                2700, 0, 3000, 10), 40, 100);
        assertThat(s.intervals()).extracting(FrceStatistics.Interval::mean).containsExactly(20.0, -50.0, 120.0, 5.0);
        assertThat(s.intervals().get(1).startMs()).isEqualTo(Series.Q0_MS + 900_000L);
        // mean of means = (20 − 50 + 120 + 5)/4 = 95/4 = 23.75
        assertThat(s.meanOfMeans()).isCloseTo(23.75, within(1e-12));
        // deviations −3.75, −73.75, 96.25, −18.75 → squares 14.0625 + 5439.0625 + 9264.0625 + 351.5625 = 15068.75
        // σ = √(15068.75/4) = √3767.1875 = 61.3774
        assertThat(s.sigmaOfMeans()).isCloseTo(61.3774, within(1e-4));
        // |mean| > 40: −50, 120 → 2 (50 %); |mean| > 100: 120 → 1 (25 %)
        assertThat(s.outsideLevel1()).isEqualTo(2);
        assertThat(s.outsideLevel2()).isEqualTo(1);
        assertThat(s.outsideLevel1Pct()).isEqualTo(50.0);
        assertThat(s.outsideLevel2Pct()).isEqualTo(25.0);
        // sorted −50, 5, 20, 120: p1, p5, p10 → rank 1 → −50; p90, p95, p99 → rank 4 → 120
        assertThat(s.p1()).isEqualTo(-50.0);
        assertThat(s.p10()).isEqualTo(-50.0);
        assertThat(s.p90()).isEqualTo(120.0);
    }
}
