package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.Arrays;
import org.junit.jupiter.api.Test;

/** BAAL per NERC BAL-001-2 (formula re-derived from memory). */
class BaalEvaluatorTest {
    private static final double B = -50.0; // −10B = 500 MW/Hz
    private static final double EPS = 0.018; // Eastern; 3ε1 = 0.054 Hz, 9ε1² = 0.002916 Hz²

    @Test
    void shouldComputeTheLimitsByHand() {
        // FA = 59.97: BAAL_Low = (500 × −0.054) × (−0.054 / −0.03) = −27 × 1.8 = −48.6 MW
        assertThat(BaalEvaluator.baalLowMw(59.97, 60.0, B, EPS)).isCloseTo(-48.6, within(1e-9));
        // FA = 60.02: BAAL_High = (500 × 0.054) × (0.054 / 0.02) = 27 × 2.7 = 72.9 MW
        assertThat(BaalEvaluator.baalHighMw(60.02, 60.0, B, EPS)).isCloseTo(72.9, within(1e-9));
        // At the trigger limit FA = FS − 3ε1 = 59.946 the limit is −10B·(−3ε1) = −27 MW
        assertThat(BaalEvaluator.baalLowMw(59.946, 60.0, B, EPS)).isCloseTo(-27.0, within(1e-9));
        // No low limit above schedule, no high limit below
        assertThat(BaalEvaluator.baalLowMw(60.01, 60.0, B, EPS)).isEqualTo(Double.NEGATIVE_INFINITY);
        assertThat(BaalEvaluator.baalHighMw(59.99, 60.0, B, EPS)).isEqualTo(Double.POSITIVE_INFINITY);
    }

    @Test
    void shouldFlagMinutesOutsideTheLimit() {
        // Minute 1: FA 59.97, ACE −50 < −48.6 → exceeded. Minute 2: FA 59.97, ACE −40 → within.
        // Minute 3: FA 60.02, ACE 80 > 72.9 → exceeded. Minute 4: FA 60.02, ACE −500 → no low limit above FS → within.
        BaalEvaluator.Result r = BaalEvaluator.evaluate(Series.perMinute("MW", -50, -40, 80, -500),
                Series.perMinute("Hz", 59.97, 59.97, 60.02, 60.02), 60.0, B, EPS);
        assertThat(r.minutes()).extracting(BaalEvaluator.Minute::exceeded).containsExactly(true, false, true, false);
        assertThat(r.exceedanceMinutes()).isEqualTo(2);
        assertThat(r.longestExceedanceMinutes()).isEqualTo(1);
        assertThat(r.passes()).isTrue();
    }

    @Test
    void shouldPassThirtyConsecutiveExceedingMinutesAndFailThirtyOne() {
        assertThat(evaluateRun(30).passes()).isTrue();
        BaalEvaluator.Result r31 = evaluateRun(31);
        assertThat(r31.longestExceedanceMinutes()).isEqualTo(31);
        assertThat(r31.longestRunStartMs()).isEqualTo(Series.T0_MS + 60_000L); // run starts in minute 2
        assertThat(r31.passes()).isFalse();
    }

    /** One quiet minute, then {@code n} minutes at ACE −50 MW with FA 59.97 Hz, then one quiet minute. */
    private static BaalEvaluator.Result evaluateRun(int n) {
        double[] ace = new double[n + 2];
        double[] f = new double[n + 2];
        Arrays.fill(ace, -50);
        Arrays.fill(f, 59.97);
        ace[0] = 0;
        ace[n + 1] = 0;
        return BaalEvaluator.evaluate(Series.perMinute("MW", ace), Series.perMinute("Hz", f), 60.0, B, EPS);
    }
}
