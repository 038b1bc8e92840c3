package org.loopstand.controller.regulation;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class AreaRegulatorTest {
    private static RegulationSettings noFilter() {
        return RegulationSettings.builder().filterTimeConstantS(0).kp(0).integralTimeS(40).cycleS(4)
                .quietMw(10).assistMw(200).build();
    }

    @Test
    void shouldClassifyBands() {
        AceBands b = new AceBands(10, 200);
        assertThat(b.classify(-9.9)).isEqualTo(AceBand.QUIET);
        assertThat(b.classify(10)).isEqualTo(AceBand.REGULATING);
        assertThat(b.classify(-200)).isEqualTo(AceBand.REGULATING);
        assertThat(b.classify(200.1)).isEqualTo(AceBand.ASSIST);
        assertThat(b.classify(-250)).isEqualTo(AceBand.ASSIST);
    }

    @Test
    void shouldHoldLevelInQuietBand() {
        AreaRegulator r = new AreaRegulator(noFilter());
        RegulationResult first = r.step(-100, -500, 500);
        assertThat(first.levelMw()).isCloseTo(10, within(1e-9));
        RegulationResult quiet = r.step(-5, -500, 500);
        assertThat(quiet.band()).isEqualTo(AceBand.QUIET);
        assertThat(quiet.changeMw()).isZero();
        assertThat(quiet.levelMw()).isCloseTo(10, within(1e-9));
        RegulationResult again = r.step(-20, -500, 500);
        assertThat(again.levelMw()).isCloseTo(12, within(1e-9));
    }

    @Test
    void shouldFilterWithTimeConstant() {
        ExponentialSmoother f = new ExponentialSmoother(8, 4);
        assertThat(f.alpha()).isCloseTo(1 - Math.exp(-0.5), within(1e-12));
        f.update(0);
        assertThat(f.update(100)).isCloseTo(100 * (1 - Math.exp(-0.5)), within(1e-9));
        // a step reaches 1 - e^-1 after one time constant (two cycles)
        f.reset();
        f.update(0);
        f.update(100);
        assertThat(f.update(100)).isCloseTo(100 * (1 - Math.exp(-1)), within(1e-9));
    }

    @Test
    void shouldResumeAtCurrentLevel() {
        AreaRegulator r = new AreaRegulator(noFilter());
        r.step(-100, -500, 500);
        r.suspend();
        assertThat(r.suspended()).isTrue();
        r.resume(37, -50);
        RegulationResult out = r.step(-50, -500, 500);
        assertThat(out.levelMw()).isCloseTo(37 + 5, within(1e-9));
    }

    @Test
    void shouldRejectInvalidSettings() {
        assertThatThrownBy(() -> RegulationSettings.builder().cycleS(0).quietMw(50).assistMw(20).build())
                .hasMessageContaining("cycleS").hasMessageContaining("assistMw");
    }
}
