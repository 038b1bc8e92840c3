package org.loopstand.controller.pulsetest;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class SteadinessTest {
    private static List<TelemetryPoint> readings(double... mw) {
        List<TelemetryPoint> t = new ArrayList<>();
        for (int i = 0; i < mw.length; i++) {
            t.add(new TelemetryPoint(2_000L * (i + 1), mw[i], 700, true, Double.NaN));
        }
        return t;
    }

    @Test
    void shouldFindASteadyOutputAndFrequency() {
        // readings every 2 s from 2 s to 20 s
        List<TelemetryPoint> t = readings(700, 700, 700, 700, 700, 700.2, 699.8, 700.1, 699.9, 700.0);
        List<FrequencyPoint> f = List.of(new FrequencyPoint(15_000, 50.02), new FrequencyPoint(19_000, 49.99));
        Steadiness s = Steadiness.over(t, f, 20_000, 0, 10, 0.5, 0.3, 50.0, 0.05);
        // readings after 10 s (12..20 s): 700.2, 699.8, 700.1, 699.9, 700.0, mean 700.0: spread 0.2 MW; 20 mHz off
        assertThat(s.outputSpreadMw()).isCloseTo(0.2, within(1e-9));
        assertThat(s.frequencyOffsetHz()).isCloseTo(0.02, within(1e-9));
        assertThat(s.steady()).isTrue();
    }

    @Test
    void shouldNotCallASlowCreepSteadyEvenInsideTheBand() {
        // rising 0.1 MW a reading: every reading within ±0.5 MW of the mean, yet the unit is still moving
        List<TelemetryPoint> t = readings(700, 700.1, 700.2, 700.3, 700.4, 700.5, 700.6, 700.7, 700.8, 700.9);
        Steadiness s = Steadiness.over(t, List.of(), 20_000, 0, 10, 0.5, 0.2, Double.NaN, 0.05);
        // readings at 12..20 s: 700.5..700.9; first half (t ≤ 15 s) 700.5, 700.6 → 700.55, second 700.7..700.9 → 700.8
        assertThat(s.outputDriftMw()).isCloseTo(0.25, within(1e-9));
        assertThat(s.outputSpreadMw()).isLessThanOrEqualTo(0.5);
        assertThat(s.steady()).isFalse();
        assertThat(s.describe()).contains("drifted +0.25 MW").contains("frequency not checked");
    }

    @Test
    void shouldRefuseAFrequencyFarFromNominalWithTheFigure() {
        List<TelemetryPoint> t = readings(700, 700, 700, 700, 700, 700, 700, 700, 700, 700);
        Steadiness s = Steadiness.over(t, List.of(new FrequencyPoint(18_000, 50.37)), 20_000, 0, 10, 0.5, 0.3, 50.0,
                0.05);
        assertThat(s.steady()).isFalse();
        assertThat(s.describe()).contains("frequency up to 370.0 mHz from nominal (band ±50.0 mHz)");
    }

    @Test
    void shouldNotBeSteadyBeforeTheStretchIsCovered() {
        List<TelemetryPoint> t = readings(700, 700, 700, 700, 700);
        // waiting since 5 s: at 10 s only 5 s of the 10 s are covered
        assertThat(Steadiness.over(t, List.of(), 10_000, 5_000, 10, 0.5, 0.3, Double.NaN, 0.05).steady()).isFalse();
        assertThat(Steadiness.over(t, List.of(), 10_000, 0, 10, 0.5, 0.3, Double.NaN, 0.05).steady()).isTrue();
    }
}
