package org.loopstand.report.metrics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class InadvertentEnergyTest {
    @Test
    void shouldIntegrateTheDeviationFromAStepScheduleByTrapezoids() {
        // NIa 110, 110, 130, 90 MW at 0, 1800, 3600, 5400 s; NIs 100 MW, stepping to 120 MW at 3600 s.
        // deviations 10, 10, 10, −30 MW.
        // trapezoids: (10+10)/2 · 0.5 h = 5; (10+10)/2 · 0.5 = 5; (10−30)/2 · 0.5 = −5 MWh → net 5 MWh
        InadvertentEnergy e = InadvertentEnergy.of(
                Series.of("MW", Series.T0_MS, 0, 110, 1800, 110, 3600, 130, 5400, 90),
                Series.of("MW", Series.T0_MS, 0, 100, 3600, 120));
        assertThat(e.netMwh()).isCloseTo(5.0, within(1e-12));
        assertThat(e.overMwh()).isCloseTo(10.0, within(1e-12));
        assertThat(e.underMwh()).isCloseTo(-5.0, within(1e-12));
        assertThat(e.durationS()).isEqualTo(5400.0);
    }
}
