package org.loopstand.controller.pulsetest.programme;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.pulsetest.governor.GovernorSpec;

class SiteUnitReaderTest {
    private static final Path DEMO = Path.of("..", "config", "sites", "demo-site.yaml");

    @Test
    void shouldReadTheDeclaredFiguresOfADemoUnit() {
        SiteUnitReader.SiteUnit u = SiteUnitReader.read(DEMO, "basin-steam-1");
        assertThat(u.siteId()).isEqualTo("demo-site");
        assertThat(u.unit()).isEqualTo(new UnitDeclaration("basin-steam-1", 500, 870, 20, 18, "site file " + DEMO));
    }

    @Test
    void shouldFallBackToOutputLimitsWithoutRegulatingLimits() {
        UnitDeclaration u = SiteUnitReader.read(DEMO, "ridge-hydro-1").unit();
        assertThat(u.regulatingMinMw()).isEqualTo(50);
        assertThat(u.regulatingMaxMw()).isEqualTo(500);
    }

    @Test
    void shouldReadTheGovernorWhoseAnswerIsRemoved() {
        // basin-steam-1: 900 MW / (5 % × 50 Hz) = 360 MW/Hz, ±10 mHz, reheat: 30 % through governor + steam
        // chest (0.2 + 0.3 s), the rest also through the 7 s reheater
        assertThat(SiteUnitReader.read(DEMO, "basin-steam-1").governor())
                .isEqualTo(new GovernorSpec("north-basin", 50, 360, 0.01, 0.3, 0.5, 7));
        // basin-gas-1: 600 / (5 % × 50) = 240 MW/Hz, no dead band, governor + turbine 0.2 + 0.4 s
        GovernorSpec gas = SiteUnitReader.read(DEMO, "basin-gas-1").governor();
        assertThat(gas.gainMwPerHz()).isEqualTo(240);
        assertThat(gas.deadBandHz()).isZero();
        assertThat(gas.fastShare()).isEqualTo(1);
        assertThat(gas.fastLagS()).isCloseTo(0.6, org.assertj.core.api.Assertions.within(1e-9));
        assertThat(gas.slowLagS()).isZero();
        // ridge-hydro-1: 500 / (5 % × 50) = 200 MW/Hz; transient droop holds the answer back by
        // Rt/R × Tr = 43 / 5 × 9 = 77.4 s, plus the 0.5 s governor
        GovernorSpec hydro = SiteUnitReader.read(DEMO, "ridge-hydro-1").governor();
        assertThat(hydro.gainMwPerHz()).isEqualTo(200);
        assertThat(hydro.fastLagS()).isCloseTo(77.9, org.assertj.core.api.Assertions.within(1e-9));
        assertThat(hydro.area()).isEqualTo("south-ridge");
    }
}
