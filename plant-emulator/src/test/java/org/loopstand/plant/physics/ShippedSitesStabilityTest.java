package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.hipparchus.complex.Complex;
import org.loopstand.plant.site.SiteLoader;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The shipped sites must be small-signal stable with some margin: the model has no damper windings, so a
 * stiff tie plus governor lag can give an undamped swing (see docs/physics.md). Linearised numerically at
 * the operating point, eigenvalues by Hipparchus.
 */
class ShippedSitesStabilityTest {

    @ParameterizedTest
    @ValueSource(strings = {"demo-site.yaml", "three-area.yaml", "three-area-50.yaml", "four-unit-dispatch.yaml"})
    void shouldHaveOnlyDampedModes(String file) throws Exception {
        GridSimulator sim = new GridSimulator(SiteLoader.load(Path.of("..", "config", "sites", file)));
        for (Complex mode : SmallSignalStability.eigenvalues(sim)) {
            assertThat(mode.getReal()).as("mode %s", mode).isLessThan(1e-6);
            if (Math.abs(mode.getImaginary()) > 1e-6) {
                double dampingRatio = -mode.getReal() / mode.norm();
                // common practice, no source: at least 3 % damping for electromechanical modes
                assertThat(dampingRatio).as("damping ratio of %s", mode).isGreaterThan(0.03);
            }
        }
    }

    @ParameterizedTest
    @ValueSource(strings = {"demo-site.yaml", "three-area.yaml", "three-area-50.yaml", "four-unit-dispatch.yaml"})
    void shouldLoadForARunWithoutRefusalOrWarningAndNameTheLeastDampedMode(String file) throws Exception {
        Path site = Path.of("..", "config", "sites", file);
        List<String> warnings = new ArrayList<>();
        SiteLoader.loadForRun(site, warnings::add);
        assertThat(warnings).isEmpty();
        SmallSignalStability.Report report = SmallSignalStability.assess(SiteLoader.load(site));
        assertThat(report.verdict()).isEqualTo(SmallSignalStability.Verdict.STABLE);
        assertThat(report.describe()).startsWith("stable: least-damped mode ").contains(" Hz, damping ratio ", "areas ");
        assertThat(report.leastDamped().dampingRatio()).isGreaterThanOrEqualTo(SmallSignalStability.MIN_DAMPING_RATIO);
    }
}
