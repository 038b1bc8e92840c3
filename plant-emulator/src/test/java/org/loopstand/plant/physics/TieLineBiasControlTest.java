package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * The simulator in a closed loop with a minimal integral tie-line bias controller written here (the real
 * controller lives in its own module): checks that the physics and its API behave as the textbook says
 * secondary control should.
 */
class TieLineBiasControlTest {

    @ParameterizedTest
    @EnumSource(Integrator.class)
    void shouldReturnFrequencyAndTieFlowToScheduleWithArea1PickingUpItsOwnLoad(Integrator integrator) {
        // Saadat, ch. 12; Kundur, ch. 11 (from memory): with tie-line bias control and bias = β,
        // Δf → 0, ΔP12 → 0 and area 1 alone picks up its 187.5 MW. β in MW/Hz: β1 = 20.6 pu·1000/60, β2 = 16.9 pu·1000/60.
        Grid grid = TextbookGrids.twoArea();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, integrator);
        double[] betaMwPerHz = {20.6 * 1000 / 60, 16.9 * 1000 / 60};
        double integralGainPerS = 0.3; // common practice, no source: slow enough not to fight primary control
        sim.stepLoadMw("area1", 187.5);
        double[] reference = {500, 500};
        while (sim.timeS() < 300) {
            for (int a = 0; a < 2; a++) {
                double ace = sim.netInterchangeMw(a) + betaMwPerHz[a] * sim.frequencyDeviationHz(a);
                reference[a] -= integralGainPerS * ace * sim.stepS();
                sim.setLoadReferenceMw(a, reference[a]);
            }
            sim.step();
        }
        assertThat(sim.frequencyHz("area1") - 60).isCloseTo(0, within(1e-3));
        assertThat(sim.tieFlowMw("tie12")).isCloseTo(0, within(0.5));
        assertThat(sim.outputMw("gen1") - 500).isCloseTo(187.5, within(0.5));
        assertThat(sim.outputMw("gen2") - 500).isCloseTo(0, within(0.5));
    }

    @Test
    void shouldShipDemoSitesWhoseBiasIsNearTheNaturalResponse() throws Exception {
        // Textbook setting, the trade's rule of thumb (common practice, no source): bias near β = D + Σ 1/R.
        for (String file : new String[] {"demo-site.yaml", "three-area.yaml"}) {
            Grid grid = SiteLoader.load(Path.of("..", "config", "sites", file));
            for (Area area : grid.areas()) {
                double beta = area.dampingMwPerHz();
                for (GeneratingUnit u : grid.units()) {
                    if (u.area().equals(area.id())) {
                        beta += u.governorGainMwPerHz(area.nominalFrequencyHz());
                    }
                }
                double setting = Double.isNaN(area.kMwPerHz()) ? -10 * area.biasMwPer01Hz() : area.kMwPerHz();
                assertThat(setting).as("bias of %s in %s", area.id(), file).isCloseTo(beta, within(0.1 * beta));
            }
        }
    }
}
