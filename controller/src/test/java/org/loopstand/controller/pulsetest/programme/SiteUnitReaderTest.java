package org.loopstand.controller.pulsetest.programme;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;

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
}
