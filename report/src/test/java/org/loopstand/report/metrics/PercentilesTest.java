package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class PercentilesTest {
    @Test
    void shouldTakeTheValueOfRankCeilingPTimesN() {
        double[] v = {40, 10, 30, 20, Double.NaN};
        // Nearest rank, n = 4 (NaN skipped), sorted 10, 20, 30, 40:
        // p25 → rank ⌈1.0⌉ = 1 → 10; p50 → rank 2 → 20; p51 → ⌈2.04⌉ = 3 → 30; p100 → 40.
        assertThat(Percentiles.nearestRank(v, 25)).isEqualTo(10);
        assertThat(Percentiles.nearestRank(v, 50)).isEqualTo(20);
        assertThat(Percentiles.nearestRank(v, 51)).isEqualTo(30);
        assertThat(Percentiles.nearestRank(v, 100)).isEqualTo(40);
        assertThat(Percentiles.nearestRank(new double[0], 50)).isNaN();
    }
}
