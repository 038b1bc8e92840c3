package org.loopstand.controller.pulsetest.analysis;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulsetest.plan.StepKind;
import org.loopstand.protocol.message.PulseDirection;

class StepResponseAnalyzerTest {
    private final StepResponseAnalyzer analyzer = new StepResponseAnalyzer(0.3, 5, 5, 0.5);

    /** Samples every second from −20 s to +200 s of f(t in s). */
    private static List<OutputSample> series(DoubleUnaryOperator f) {
        List<OutputSample> s = new ArrayList<>();
        for (int t = -20; t <= 200; t++) {
            s.add(new OutputSample(t * 1000L, f.applyAsDouble(t)));
        }
        return s;
    }

    private static StepWindow raise(double mw, double pulseS) {
        return new StepWindow("s", StepKind.STAIRCASE, PulseDirection.RAISE, 0, -1, 200_000, mw, pulseS);
    }

    @Test
    void shouldRecoverDeadTimeRampAndGainOfAnIdealRamp() {
        // 100 MW, 6 s dead time, then 12 MW/min (0.2 MW/s) for 50 s to 110 MW.
        List<OutputSample> s = series(t -> 100 + 0.2 * Math.max(0, Math.min(50, t - 6)));
        StepMeasurement m = analyzer.analyze(raise(10, 20), s);
        assertThat(m.baselineMw()).isCloseTo(100, within(1e-9));
        assertThat(m.finalMw()).isCloseTo(110, within(1e-9));
        assertThat(m.rampMwPerMin()).isCloseTo(12, within(1e-6));
        assertThat(m.deadTimeS()).isCloseTo(6, within(1e-6));
        assertThat(m.firstMovementS()).isEqualTo(8); // first sample above 0.3 MW: 0.4 MW at t = 8 s
        assertThat(m.gainMwPerPulseS()).isCloseTo(0.5, within(1e-9));
        assertThat(m.overshootPct()).isZero();
        // band max(0.5, 5 % of 10) = 0.5 MW: within it from 0.2·(t−6) ≥ 9.5, t = 53.5 → first sample 54 s
        assertThat(m.settlingTimeS()).isEqualTo(54);
        assertThat(m.finalErrorMw()).isCloseTo(0, within(1e-9));
    }

    @Test
    void shouldMeasureOvershootAgainstTheFinalValue() {
        // Rises to 112 MW at 60 s, then comes back to 110 MW by 80 s: overshoot 2 / 10 = 20 %.
        List<OutputSample> s = series(t -> t <= 0 ? 100 : t <= 60 ? 100 + 0.2 * t : t <= 80 ? 112 - 0.1 * (t - 60) : 110);
        StepMeasurement m = analyzer.analyze(raise(10, 20), s);
        assertThat(m.overshootPct()).isCloseTo(20, within(1e-9));
        // band 0.5 MW: last sample outside is t = 74 s (110.6 MW); 75 s is at the band edge (110.5), inside
        assertThat(m.settlingTimeS()).isEqualTo(75);
    }

    @Test
    void shouldFlagAMoveAgainstTheCommand() {
        List<OutputSample> s = series(t -> 100 - 0.2 * Math.max(0, Math.min(50, t)));
        StepMeasurement m = analyzer.analyze(raise(10, 20), s);
        assertThat(m.opposite()).isTrue();
        assertThat(m.gainMwPerPulseS()).isCloseTo(-0.5, within(1e-9));
        assertThat(m.deadTimeS()).isNaN();
    }

    @Test
    void shouldNotMeasureARampWhenNothingMoves() {
        StepMeasurement m = analyzer.analyze(raise(10, 20), series(t -> 100));
        assertThat(m.rampMwPerMin()).isNaN();
        assertThat(m.firstMovementS()).isNaN();
        assertThat(m.gainMwPerPulseS()).isZero();
        assertThat(m.finalErrorMw()).isCloseTo(-10, within(1e-9));
    }
}
