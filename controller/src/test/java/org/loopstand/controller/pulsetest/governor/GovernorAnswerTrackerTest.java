package org.loopstand.controller.pulsetest.governor;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class GovernorAnswerTrackerTest {
    /** basin-steam-1 of the demo site: 900 MW, droop 5 %, 50 Hz, dead band ±10 mHz, reheat 7 s, HP share 0.3. */
    static final GovernorSpec STEAM = new GovernorSpec("north-basin", 50, 900 / 0.05 / 50, 0.01, 0.3, 0.5, 7);

    @Test
    void shouldAnswerOnlyTheDeviationBeyondTheDeadBand() {
        assertThat(STEAM.gainMwPerHz()).isEqualTo(360.0);
        // 30 mHz high: 20 mHz beyond the band × 360 MW/Hz = 7.2 MW less
        assertThat(STEAM.staticAnswerMw(50.03)).isCloseTo(-7.2, within(1e-9));
        assertThat(STEAM.staticAnswerMw(49.995)).isZero();
        assertThat(STEAM.staticAnswerMw(50.01)).isZero();
        assertThat(STEAM.staticAnswerMw(49.98)).isCloseTo(3.6, within(1e-9));
    }

    @Test
    void shouldFollowAFrequencyStepThroughTheTurbineLags() {
        GovernorAnswerTracker r = new GovernorAnswerTracker(STEAM);
        r.frequency(0, 50.0);
        assertThat(r.answerMwAt(0)).isZero();
        r.frequency(0, 50.03);
        // Step of −7.2 MW through 0.3·lag(0.5 s) + 0.7·lag(0.5 s)·lag(7 s); two lags in series:
        // 1 − (Ts·e^(−t/Ts) − Tf·e^(−t/Tf)) / (Ts − Tf). At 2 s: −3.0888 MW; at 7 s: −5.2033 MW (worked out
        // by hand from the closed form).
        assertThat(r.answerMwAt(2_000)).isCloseTo(-3.0888, within(1e-3));
        assertThat(r.answerMwAt(7_000)).isCloseTo(-5.2033, within(1e-3));
        assertThat(r.answerMwAt(120_000)).isCloseTo(-7.2, within(1e-6));
    }

    @Test
    void shouldGiveTheSameAnswerWhetherAskedOnceOrOften() {
        GovernorAnswerTracker once = new GovernorAnswerTracker(STEAM);
        GovernorAnswerTracker often = new GovernorAnswerTracker(STEAM);
        once.frequency(0, 50.0);
        often.frequency(0, 50.0);
        once.frequency(0, 50.03);
        often.frequency(0, 50.03);
        for (long t = 100; t < 7_000; t += 100) {
            often.answerMwAt(t);
        }
        assertThat(often.answerMwAt(7_000)).isCloseTo(once.answerMwAt(7_000), within(1e-9));
    }

    @Test
    void shouldStartInSteadyStateAtTheFirstReading() {
        GovernorAnswerTracker r = new GovernorAnswerTracker(STEAM);
        assertThat(r.answerMwAt(0)).isNaN();
        r.frequency(1_000, 49.98);
        assertThat(r.answerMwAt(1_000)).isCloseTo(3.6, within(1e-9));
    }

    @Test
    void shouldRefuseANonsenseGovernor() {
        assertThatThrownBy(() -> new GovernorSpec("a", 0, -1, Double.NaN, 2, -1, 0))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("nominal frequency").hasMessageContaining("governor gain")
                .hasMessageContaining("dead band").hasMessageContaining("fast share").hasMessageContaining("lags");
    }
}
