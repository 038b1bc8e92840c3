package org.loopstand.controller.regulation;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class PiRegulatorTest {
    @Test
    void shouldLowerForPositiveAce() {
        PiRegulator pi = new PiRegulator(0.5, 40, 4);
        // e = -100; I = 4/40*(-100) = -10; u = 0.5*(-100) + (-10) = -60
        assertThat(pi.step(100, -1000, 1000)).isCloseTo(-60, within(1e-9));
    }

    @Test
    void shouldNotWindUpWhileSaturated() {
        PiRegulator pi = new PiRegulator(0.0, 40, 4);
        for (int i = 0; i < 1000; i++) {
            pi.step(-100, -50, 50);
        }
        assertThat(pi.saturated()).isTrue();
        assertThat(pi.integratorMw()).isLessThanOrEqualTo(50);
        // as soon as the error reverses, the output leaves the limit at once (no wound-up integrator)
        double out = pi.step(100, -50, 50);
        assertThat(out).isCloseTo(40, within(1e-9));
    }

    @Test
    void shouldHoldIntegratorWhenFrozen() {
        PiRegulator pi = new PiRegulator(0.2, 40, 4);
        pi.step(-100, -1000, 1000);
        double held = pi.integratorMw();
        pi.freeze();
        for (int i = 0; i < 10; i++) {
            pi.step(-100, -1000, 1000);
        }
        assertThat(pi.integratorMw()).isEqualTo(held);
    }

    @Test
    void shouldResumeBumplessAfterTracking() {
        PiRegulator pi = new PiRegulator(0.3, 60, 4);
        pi.track(120, -10);
        // next step with the same ACE: only one cycle of integration on top of 120
        double out = pi.step(-10, -1000, 1000);
        assertThat(out).isCloseTo(120 + 4.0 / 60 * 10, within(1e-9));
        pi.reset();
        assertThat(pi.integratorMw()).isZero();
    }
}
