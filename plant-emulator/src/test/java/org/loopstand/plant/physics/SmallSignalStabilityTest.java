package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.hipparchus.complex.Complex;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;

class SmallSignalStabilityTest {
    static final Path UNSTABLE_SITE = Path.of("src", "test", "resources", "sites", "unstable-three-area.yaml");

    @Test
    void shouldGiveFrequencyAndDampingRatioOfAMode() {
        // ζ = −σ/√(σ² + ω²) and f = ω/2π (Kundur, Power System Stability and Control, ch. 12, from memory):
        // σ = −0.5 1/s, ω = 2π rad/s gives 1 Hz and ζ = 0.5/√(0.25 + 4π²) = 0.07933.
        SmallSignalStability.Mode mode = new SmallSignalStability.Mode(-0.5, 2 * Math.PI, List.of("a"));
        assertThat(mode.frequencyHz()).isCloseTo(1.0, within(1e-12));
        assertThat(mode.dampingRatio()).isCloseTo(0.07933, within(1e-5));
    }

    @Test
    void shouldFindTheSameLeastDampedModeAsTheIndependentTwoAreaModel() {
        // The textbook two-area system with a stiffer tie, written out independently as a matrix (TwoAreaLinearModel)
        double tieMwPerRad = 50;
        Complex expected = ReferenceIntegratorTest.leastDampedOscillatoryMode(new TwoAreaLinearModel(tieMwPerRad).a());
        SmallSignalStability.Report report = SmallSignalStability.assess(TextbookGrids.twoArea(tieMwPerRad));
        assertThat(report.leastDamped().realPerS()).isCloseTo(expected.getReal(), within(1e-4));
        assertThat(report.leastDamped().imagRadPerS()).isCloseTo(expected.getImaginary(), within(1e-4));
        // an inter-area swing: both areas take part
        assertThat(report.leastDamped().areas()).containsExactlyInAnyOrder("area1", "area2");
    }

    @Test
    void shouldRefuseTheUnstableThreeAreaSiteNamingItsGrowingMode() throws Exception {
        SmallSignalStability.Report report = SmallSignalStability.assess(SiteLoader.load(UNSTABLE_SITE));
        assertThat(report.verdict()).isEqualTo(SmallSignalStability.Verdict.UNSTABLE);
        SmallSignalStability.Mode mode = report.worst();
        assertThat(mode.realPerS()).isGreaterThan(SmallSignalStability.UNSTABLE_REAL_PART_PER_S);
        assertThat(mode.dampingRatio()).isNegative();
        // stiff ties (2000 MW/rad) on light areas: the inter-area swing sits above 1 Hz, all three areas in it
        assertThat(mode.frequencyHz()).isBetween(1.0, 2.0);
        assertThat(mode.areas()).containsExactlyInAnyOrder("alder-fen", "brook-moor", "crest-dale");

        List<String> warnings = new ArrayList<>();
        assertThatThrownBy(() -> SiteLoader.loadForRun(UNSTABLE_SITE, warnings::add))
                .isInstanceOf(ConfigFileException.class)
                .hasMessageContaining("unstable-three-area.yaml: site refused by the stability screen: unstable")
                .hasMessageContaining(String.format(java.util.Locale.ROOT, "%.3f Hz", mode.frequencyHz()))
                .hasMessageContaining("damping ratio -")
                .hasMessageContaining("alder-fen");
    }

    @Test
    void shouldGrowInTheSimulatorAsTheScreenSays() {
        // The refusal is not a numerical artefact: the simulator itself swings with growing amplitude.
        GridSimulator sim;
        try {
            sim = new GridSimulator(SiteLoader.load(UNSTABLE_SITE));
        } catch (java.io.IOException e) {
            throw new AssertionError(e);
        }
        sim.stepLoadMw("alder-fen", 20);
        double early = 0;
        double late = 0;
        while (sim.timeS() < 200) {
            sim.step();
            double swingHz = Math.abs(sim.frequencyHz("alder-fen") - sim.frequencyHz("crest-dale"));
            if (sim.timeS() > 20 && sim.timeS() <= 40) {
                early = Math.max(early, swingHz);
            } else if (sim.timeS() > 180) {
                late = Math.max(late, swingHz);
            }
        }
        assertThat(late).isGreaterThan(2 * early);
    }

    @Test
    void shouldWarnBelowTheDampingThresholdAndPassAbove() {
        // The three shipped meshed sites keep 3.4–4.1 % on their inter-area swing; the textbook pair at 50 MW/rad
        // has about 2.7 % (−0.07 ± 2.6j), below the stated 3 %.
        SmallSignalStability.Report light = SmallSignalStability.assess(TextbookGrids.twoArea(50));
        assertThat(light.leastDamped().dampingRatio()).isLessThan(SmallSignalStability.MIN_DAMPING_RATIO);
        assertThat(light.verdict()).isEqualTo(SmallSignalStability.Verdict.LIGHTLY_DAMPED);
        assertThat(light.describe()).startsWith("lightly damped: least-damped mode below 3 % damping: 0.4");
    }
}
