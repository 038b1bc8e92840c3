package org.loopstand.controller.following;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class GovernorResponseTest {
    @Test
    void shouldDeriveTheResponseFromRatingAndDroop() {
        // K = P_rated / (R · f0): 700 MW at 4 % droop on 50 Hz = 350 MW/Hz (the steady-state droop law,
        // Kundur ch. 11, from memory)
        assertThat(GovernorResponse.mwPerHz(700, 4, 50)).isCloseTo(350, within(1e-9));
        assertThat(GovernorResponse.mwPerHz(1000, 5, 60)).isCloseTo(333.333, within(1e-3));
        assertThat(GovernorResponse.mwPerHz(Double.NaN, 5, 50)).isZero();
        assertThat(GovernorResponse.mwPerHz(500, Double.NaN, 50)).isZero();
    }

    @Test
    void shouldRaiseOutputOnLowFrequencyOnlyBeyondTheDeadBand() {
        GovernorResponse g = new GovernorResponse(360, 0.01);
        assertThat(g.shareMw(-0.05)).isCloseTo(14.4, within(1e-9));
        assertThat(g.shareMw(0.03)).isCloseTo(-7.2, within(1e-9));
        assertThat(g.shareMw(0.005)).isZero();
        assertThat(g.spanMw(-0.1, 0.0)).isCloseTo(32.4, within(1e-9));
        assertThat(g.spanMw(-0.004, 0.006)).isZero();
    }

    @Test
    void shouldRefuseANegativeResponse() {
        assertThatThrownBy(() -> new GovernorResponse(-1, 0)).hasMessageContaining("mwPerHz >= 0");
    }

    @Test
    void shouldKeepTheRangeOfTheWindowOnly() {
        FrequencyHistory h = new FrequencyHistory(60_000);
        h.add(0, -0.2);
        h.add(30_000, -0.05);
        assertThat(h.range()).containsExactly(-0.2, -0.05);
        h.add(70_000, 0.01); // the −0.2 sample is now older than the window
        assertThat(h.range()).containsExactly(-0.05, 0.01);
    }
}
