package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import org.loopstand.report.model.TimeSeries;

/** CPS1 per NERC BAL-001-2 (formula and ε1 from memory). */
class Cps1CalculatorTest {
    private static final double B = -50.0; // MW/0.1 Hz → −10B = 500 MW/Hz

    @Test
    void shouldMatchAHandWorkedThreeMinuteCase() {
        // Two ACE samples per clock minute; minute means −10, +20, +5 MW.
        TimeSeries ace = Series.of("MW", Series.T0_MS, 0, -5, 30, -15, 60, 20, 90, 20, 120, 0, 150, 10);
        // Frequency minute means 60.01, 60.02, 59.99 Hz → ΔF = +0.01, +0.02, −0.01 Hz with FS = 60.
        TimeSeries f = Series.of("Hz", Series.T0_MS, 0, 60.01, 60, 60.02, 120, 59.99);
        Cps1Calculator.Result r = Cps1Calculator.evaluate(ace, f, 60.0, B, Interconnection.EASTERN.epsilon1Hz());
        // CF terms: (−10/500)(0.01) = −0.0002; (20/500)(0.02) = 0.0008; (5/500)(−0.01) = −0.0001 Hz²
        // mean = 0.0005/3 = 1.6667e-4 Hz²; ε1² = 0.018² = 3.24e-4 Hz²; CF = 0.514403; CPS1 = (2 − 0.514403)·100 = 148.560 %
        assertThat(r.minutes()).isEqualTo(3);
        assertThat(r.meanCfHz2()).isCloseTo(1.6666667e-4, within(1e-10));
        assertThat(r.cf()).isCloseTo(0.514403, within(1e-6));
        assertThat(r.cps1Pct()).isCloseTo(148.5597, within(1e-3));
        assertThat(r.passes()).isTrue();
    }

    @Test
    void shouldFailWhenAceLeansOnFrequencyHardEnough() {
        // One minute: ACE +100 MW while frequency is 0.03 Hz high (over-generation pushing frequency up).
        // CF term = (100/500)(0.03) = 0.006 Hz²; CF = 0.006/0.000324 = 18.5185; CPS1 = (2 − 18.5185)·100 = −1651.85 %
        Cps1Calculator.Result r = Cps1Calculator.evaluate(Series.perMinute("MW", 100), Series.perMinute("Hz", 60.03),
                60.0, B, 0.018);
        assertThat(r.cps1Pct()).isCloseTo(-1651.852, within(1e-3));
        assertThat(r.passes()).isFalse();
    }

    @Test
    void shouldUseTheEpsilonOfTheInterconnection() {
        // from memory (BAL-001-2): Eastern 0.018, Western 0.0228, ERCOT 0.030, Québec 0.0215 Hz
        assertThat(Interconnection.WESTERN.epsilon1Hz()).isEqualTo(0.0228);
        assertThat(Interconnection.ERCOT.epsilon1Hz()).isEqualTo(0.030);
        assertThat(Interconnection.QUEBEC.epsilon1Hz()).isEqualTo(0.0215);
        // Same minute as above under ERCOT: CF = 0.006/0.0009 = 6.6667; CPS1 = (2 − 6.6667)·100 = −466.667 %
        Cps1Calculator.Result r = Cps1Calculator.evaluate(Series.perMinute("MW", 100), Series.perMinute("Hz", 60.03),
                60.0, B, Interconnection.ERCOT.epsilon1Hz());
        assertThat(r.cps1Pct()).isCloseTo(-466.667, within(1e-3));
    }
}
