package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;

class StartBalanceTest {
    static final Path SITES = Path.of("..", "config", "sites");

    @Test
    void shouldFindTheDemoSiteBalancedAtHalfPastTenAndOutOfBalanceAtSeven() throws Exception {
        Grid demo = SiteLoader.load(SITES.resolve("demo-site.yaml"));

        // generation − load − scheduled export per area (conservation of power at t = 0)
        StartBalance atTen = StartBalance.of(demo, 10.5);
        assertThat(atTen.areas()).allSatisfy(a -> assertThat(a.imbalanceMw()).isCloseTo(0.0, within(1e-9)));
        assertThat(atTen.problems()).isEmpty();
        assertThat(atTen.warnings()).isEmpty();

        // at 07:00 the daily shape gives north-basin 0.93 × 1700 = 1581 MW of load against 1800 MW of units
        StartBalance atSeven = StartBalance.of(demo, 7.0);
        StartBalance.Area north = atSeven.areas().get(0);
        assertThat(north.id()).isEqualTo("north-basin");
        assertThat(north.loadMw()).isCloseTo(1581.0, within(1e-9));
        assertThat(north.imbalanceMw()).isCloseTo(1800.0 - 1581.0 - 100.0, within(1e-9));
        assertThat(north.toleranceMw()).isCloseTo(1.0 + 0.005 * 1800.0, within(1e-9));
        assertThat(atSeven.problems()).isEmpty();
        assertThat(atSeven.warnings()).hasSize(2).first().asString()
                .startsWith("area north-basin starts out of balance at hour 7.00: generation 1800.0 MW − load 1581.0 MW"
                        + " − scheduled export 100.0 MW = +119.0 MW (allowed ±10.0 MW)");
    }

    @Test
    void shouldRefuseAnAreaWithItsGenerationButNoLoad() throws Exception {
        Grid noLoads = SiteLoader.load(Path.of("src", "test", "resources", "sites", "plain-hydro-three-area.yaml"));

        StartBalance b = StartBalance.of(noLoads, 0.0);

        // west-lake: 500 + 180 MW of units, no load, 50 MW scheduled to east-lake and 10 MW to mid-lake
        assertThat(b.areas().get(0).imbalanceMw()).isCloseTo(620.0, within(1e-9));
        assertThat(b.problems()).hasSize(3);
        assertThat(b.problems().get(0)).contains("area west-lake", "= +620.0 MW", "runs refuse a start so far out of balance");
        assertThat(b.warnings()).isEmpty();
    }
}
