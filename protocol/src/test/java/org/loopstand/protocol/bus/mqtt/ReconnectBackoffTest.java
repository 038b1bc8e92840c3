package org.loopstand.protocol.bus.mqtt;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Random;
import org.junit.jupiter.api.Test;

class ReconnectBackoffTest {
    @Test
    void shouldDoubleFromInitialUntilCapped() {
        ReconnectBackoff b = new ReconnectBackoff(250, 10_000, 0, new Random(1));
        // 250 · 2^n: 250, 500, 1000, 2000, 4000, 8000, then the 10 000 ms cap.
        assertThat(new long[] {b.baseDelayMs(0), b.baseDelayMs(1), b.baseDelayMs(2), b.baseDelayMs(3),
                b.baseDelayMs(4), b.baseDelayMs(5), b.baseDelayMs(6), b.baseDelayMs(7)})
                .containsExactly(250, 500, 1000, 2000, 4000, 8000, 10_000, 10_000);
        assertThat(b.delayMs(3)).isEqualTo(2000); // no jitter: delay equals the base
    }

    @Test
    void shouldStayAtCapForHugeAttemptNumbersWithoutOverflow() {
        ReconnectBackoff b = new ReconnectBackoff(3, 60_000, 0, new Random(1));
        assertThat(b.baseDelayMs(61)).isEqualTo(60_000);
        assertThat(b.baseDelayMs(62)).isEqualTo(60_000);
        assertThat(b.baseDelayMs(Integer.MAX_VALUE)).isEqualTo(60_000);
    }

    @Test
    void shouldKeepJitteredDelaysWithinBoundsAndSpreadThem() {
        ReconnectBackoff b = new ReconnectBackoff(1_000, 8_000, 0.25, new Random(42));
        long min = Long.MAX_VALUE;
        long max = Long.MIN_VALUE;
        for (int i = 0; i < 1_000; i++) {
            long d = b.delayMs(2); // base 4000 ms, ±25 % → [3000, 5000]
            min = Math.min(min, d);
            max = Math.max(max, d);
        }
        assertThat(min).isGreaterThanOrEqualTo(3_000).isLessThan(3_100);
        assertThat(max).isLessThanOrEqualTo(5_000).isGreaterThan(4_900);
    }

    @Test
    void shouldRepeatTheSameSequenceForTheSameSeed() {
        ReconnectBackoff a = new ReconnectBackoff(100, 5_000, 0.5, new Random(7));
        ReconnectBackoff b = new ReconnectBackoff(100, 5_000, 0.5, new Random(7));
        for (int n = 0; n < 10; n++) {
            assertThat(a.delayMs(n)).isEqualTo(b.delayMs(n));
        }
    }

    @Test
    void shouldMatchFormulaForAGivenRandomDraw() {
        Random r = new Random(99);
        double u = new Random(99).nextDouble();
        ReconnectBackoff b = new ReconnectBackoff(500, 4_000, 0.2, r);
        // attempt 1: base 1000 ms; factor 1 + 0.2·(2u − 1)
        assertThat(b.delayMs(1)).isEqualTo(Math.round(1000 * (1 + 0.2 * (2 * u - 1))));
    }

    @Test
    void shouldRejectBadSettings() {
        assertThatThrownBy(() -> new ReconnectBackoff(0, 10, 0, new Random())).hasMessageContaining("initialMs");
        assertThatThrownBy(() -> new ReconnectBackoff(10, 5, 0, new Random())).hasMessageContaining("maxMs");
        assertThatThrownBy(() -> new ReconnectBackoff(10, 50, 1.0, new Random())).hasMessageContaining("jitter");
        assertThatThrownBy(() -> new ReconnectBackoff(10, 50, 0, new Random()).baseDelayMs(-1))
                .hasMessageContaining("attempt");
    }
}
