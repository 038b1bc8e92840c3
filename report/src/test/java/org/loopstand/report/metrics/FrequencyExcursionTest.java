package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import org.loopstand.report.metrics.FrequencyExcursion.Direction;
import org.loopstand.report.model.TimeSeries;

class FrequencyExcursionTest {
    private static final long D_MS = Series.T0_MS + 1000; // disturbance at 1 s

    @Test
    void shouldFindNadirZenithAndSettlingTimeByHand() {
        // f each second: 50.00 50.00 49.90 49.80 49.85 49.95 49.99 50.01 49.995 (t = 0 … 8 s)
        TimeSeries f = Series.of("Hz", Series.T0_MS, 0, 50.0, 1, 50.0, 2, 49.90, 3, 49.80, 4, 49.85, 5, 49.95, 6, 49.99,
                7, 50.01, 8, 49.995);
        FrequencyExcursion e = FrequencyExcursion.of(f, D_MS, 50.0, 0.02).orElseThrow();
        assertThat(e.nadirHz()).isEqualTo(49.80);
        assertThat(e.nadirTimeMs()).isEqualTo(Series.T0_MS + 3000);
        assertThat(e.zenithHz()).isEqualTo(50.01);
        // Within ±0.02 Hz from t = 6 s (49.99) to the end; the 50.00 at 1 s is followed by leaving the band.
        // settling time = 6 − 1 = 5 s
        assertThat(e.settlingTimeS()).hasValue(5.0);
        // A band of ±0.001 Hz is left again at 8 s (49.995): never settled
        assertThat(FrequencyExcursion.of(f, D_MS, 50.0, 0.001).orElseThrow().settlingTimeS()).isEmpty();
    }

    @Test
    void shouldJudgeAceRecoveryAgainstFifteenMinutes() {
        // from memory, NERC BAL-002: recover to zero, or to the pre-disturbance ACE if that was negative,
        // within 15 minutes (900 s).
        // Pre ACE −20 MW → recovery value −20. Disturbance at 60 s; ACE −300 (60 s), −200 (240 s), −50 (480 s),
        // −19 (600 s) → recovered at 600 s, 540 s after the disturbance → passes.
        long d = Series.T0_MS + 60_000;
        TimeSeries a1 = Series.of("MW", Series.T0_MS, 0, -20, 60, -300, 240, -200, 480, -50, 600, -19);
        FrequencyExcursion.AceRecovery r1 = FrequencyExcursion.aceRecovery(a1, d, -20, Direction.LOSS_OF_SUPPLY,
                FrequencyExcursion.BAL002_RECOVERY_PERIOD_S);
        assertThat(r1.recoveryValueMw()).isEqualTo(-20.0);
        assertThat(r1.recoveryTimeS()).hasValue(540.0);
        assertThat(r1.passes()).isTrue();

        // Pre ACE +10 MW → recovery value 0. ACE −300 (60 s), −5 (900 s), +1 (1000 s) → 940 s > 900 s → fails.
        TimeSeries a2 = Series.of("MW", Series.T0_MS, 0, 10, 60, -300, 900, -5, 1000, 1);
        FrequencyExcursion.AceRecovery r2 = FrequencyExcursion.aceRecovery(a2, d, 10, Direction.LOSS_OF_SUPPLY, 900);
        assertThat(r2.recoveryValueMw()).isEqualTo(0.0);
        assertThat(r2.recoveryTimeS().getAsDouble()).isCloseTo(940.0, within(1e-9));
        assertThat(r2.passes()).isFalse();

        // Loss of load mirrors it: pre −10 → value 0; ACE +200 (60 s), −2 (300 s) → 240 s → passes.
        TimeSeries a3 = Series.of("MW", Series.T0_MS, 0, -10, 60, 200, 300, -2);
        FrequencyExcursion.AceRecovery r3 = FrequencyExcursion.aceRecovery(a3, d, -10, Direction.LOSS_OF_LOAD, 900);
        assertThat(r3.recoveryTimeS()).hasValue(240.0);
        assertThat(r3.passes()).isTrue();
    }
}
