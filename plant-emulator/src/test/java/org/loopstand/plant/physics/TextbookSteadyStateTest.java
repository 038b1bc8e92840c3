package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.assertj.core.api.Assertions.withinPercentage;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

class TextbookSteadyStateTest {

    @ParameterizedTest
    @EnumSource(Integrator.class)
    void shouldSettleSingleAreaAtMinusDeltaPOverDPlusOneOverR(Integrator integrator) {
        // Kundur, Power System Stability and Control, ch. 11; Saadat, ch. 12 (from memory):
        // Δf_ss = −ΔP_L / (D + 1/R) on a common base. Here in MW/Hz: 1/R = 1000 MW / 0.05 / 50 Hz = 400 MW/Hz.
        var grid = TextbookGrids.singleArea(5, 20);
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, integrator);
        sim.stepLoadMw("solo", 100);
        sim.advanceTo(120);
        double expectedHz = -100.0 / (20.0 + 400.0);
        assertThat(sim.frequencyHz("solo") - 50.0).isCloseTo(expectedHz, withinPercentage(0.5));
        assertThat(sim.outputMw("g")).isCloseTo(600 + 400 * -expectedHz, withinPercentage(0.5));
    }

    @ParameterizedTest
    @EnumSource(Integrator.class)
    void shouldReproduceTheTwoAreaWorkedExample(Integrator integrator) {
        // Saadat, Power System Analysis, ch. 12 worked example (from memory), re-derived:
        // β1 = 1/0.05 + 0.6 = 20.6, β2 = 1/0.0625 + 0.9 = 16.9 (pu on 1000 MVA);
        // Δf = −0.1875/(20.6 + 16.9) = −0.005 pu = −0.3 Hz; ΔP12 = Δf·β2 = −0.0845 pu = −84.5 MW;
        // ΔPm1 = −Δf/R1 = 0.1 pu = 100 MW; ΔPm2 = −Δf/R2 = 0.08 pu = 80 MW. Area 1 balance closes:
        // 100 − 187.5 + 0.6·0.005·1000 + 84.5 = 0.
        var grid = TextbookGrids.twoArea();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, integrator);
        sim.stepLoadMw("area1", 187.5);
        sim.advanceTo(150);
        assertThat(sim.frequencyHz("area1") - 60).isCloseTo(-0.3, withinPercentage(1));
        assertThat(sim.frequencyHz("area2") - 60).isCloseTo(-0.3, withinPercentage(1));
        assertThat(sim.tieFlowMw("tie12")).isCloseTo(-84.5, withinPercentage(1));
        assertThat(sim.outputMw("gen1") - 500).isCloseTo(100, withinPercentage(1));
        assertThat(sim.outputMw("gen2") - 500).isCloseTo(80, withinPercentage(1));
        assertThat(sim.netInterchangeMw("area1")).isCloseTo(-sim.netInterchangeMw("area2"), within(1e-9));
    }

    @Test
    void shouldRefuseAStepThatIsTooCoarse() {
        var grid = TextbookGrids.twoArea();
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new GridSimulator(grid, 0.2, 0, 0))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("too coarse")
                .hasMessageContaining("unit gen1 governor time constant");
    }

    @Test
    void shouldLetTheExactIntegratorPassTheTimeConstantLimitButNotTheSwingLimit() {
        // the exact integrator's unit blocks have no step limit; its area coupling keeps ω·h ≤ 0.5 (docs/physics.md).
        // With a 50 MW/rad tie: ω = √(2π·50·(1/M1 + 1/M2)), M = 2·H·S/f0 = 2·5·1000/60 and 2·4·1000/60 MW·s/Hz, so
        // h ≤ 0.5/ω ≈ 0.243 s.
        var grid = TextbookGrids.twoArea(50);
        double omega = Math.sqrt(2 * Math.PI * 50 * (60 / (2 * 5 * 1000.0) + 60 / (2 * 4 * 1000.0)));
        GridSimulator exact = new GridSimulator(grid, 0.24, 0, 0, Integrator.EXACT);
        exact.stepLoadMw("area1", 18.75);
        exact.advanceTo(60);
        assertThat(exact.stepS()).isEqualTo(0.24);
        assertThat(Double.isFinite(exact.frequencyHz("area1"))).isTrue();
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new GridSimulator(grid, 0.24, 0, 0, Integrator.RK4))
                .hasMessageContaining("unit gen1 governor time constant");
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new GridSimulator(grid, 0.25, 0, 0, Integrator.EXACT))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("tie tie12")
                .hasMessageContaining(String.format(java.util.Locale.ROOT, "at most %.6g s", 0.5 / omega));
    }
}
