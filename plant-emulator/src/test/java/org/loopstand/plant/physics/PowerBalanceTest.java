package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * Power balance of every area at every step: generation − load − damping − export equals the inertial
 * power M·df/dt, here measured from the trajectory itself ((f(t+h) − f(t))/h against the trapezoidal mean
 * of the balance at both ends, an O(h²) comparison). Sites without load noise, so the load is smooth.
 */
class PowerBalanceTest {

    @ParameterizedTest
    @EnumSource(Integrator.class)
    void shouldBalanceEveryAreaAtEveryStepOfTheMeshedSite(Integrator integrator) throws Exception {
        Grid grid = SiteLoader.load(Path.of("..", "config", "sites", "three-area.yaml"));
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, integrator);
        sim.stepLoadMw("cedar-coast", 50);
        double worstMw = checkBalance(sim, 60, () -> {
            if (Math.abs(sim.timeS() - 20) < 1e-9) {
                sim.rampLoadMw("ash-valley", -80, 15);
            }
        });
        assertThat(worstMw).isLessThan(0.05);
    }

    @ParameterizedTest
    @EnumSource(Integrator.class)
    void shouldBalanceTheTextbookTwoAreaSystemAfterItsLoadStep(Integrator integrator) {
        Grid grid = TextbookGrids.twoArea();
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0, 0, integrator);
        sim.stepLoadMw("area1", 187.5);
        assertThat(checkBalance(sim, 30, () -> { })).isLessThan(0.05);
    }

    /** @return the largest mismatch seen, MW; also checks that the ties' ends agree at every step */
    private static double checkBalance(GridSimulator sim, double untilS, Runnable eachStep) {
        int areas = sim.grid().areas().size();
        double h = sim.stepS();
        double[] before = balances(sim);
        double[] fBefore = frequencies(sim);
        double worst = 0;
        while (sim.timeS() < untilS) {
            eachStep.run();
            // a step or ramp starting now changes the load from this instant: take the left balance again
            before = balances(sim);
            sim.step();
            double[] after = balances(sim);
            double exportSum = 0;
            for (int a = 0; a < areas; a++) {
                double m = sim.grid().areas().get(a).inertiaMwSPerHz();
                double inertialMw = m * (sim.frequencyHz(a) - fBefore[a]) / h;
                worst = Math.max(worst, Math.abs(0.5 * (before[a] + after[a]) - inertialMw));
                exportSum += sim.netInterchangeMw(a);
            }
            // each tie's flow leaves one area and enters the other: the exports cancel
            assertThat(exportSum).isCloseTo(0.0, within(1e-9));
            fBefore = frequencies(sim);
        }
        return worst;
    }

    private static double[] balances(GridSimulator sim) {
        int areas = sim.grid().areas().size();
        double[] b = new double[areas];
        for (int a = 0; a < areas; a++) {
            b[a] = sim.generationMw(a) - sim.loadMw(a) - sim.dampingMw(a) - sim.netInterchangeMw(a);
        }
        return b;
    }

    private static double[] frequencies(GridSimulator sim) {
        double[] f = new double[sim.grid().areas().size()];
        for (int a = 0; a < f.length; a++) {
            f[a] = sim.frequencyHz(a);
        }
        return f;
    }
}
