package org.loopstand.plant.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.junit.jupiter.api.Test;

/**
 * The unit blocks' matrices are written out apart from {@link GridDynamics#derivatives}: on a site with one unit of
 * each turbine type (hydro with transient droop compensation), no limit reached, both integrators must give the same
 * trajectory of every unit, up to RK4's own error.
 */
class UnitBlocksTest {

    @Test
    void shouldFollowTheRightHandSideForEveryTurbineType() {
        GridBuilder b = new GridBuilder("three-kinds");
        b.area("a").nominalFrequencyHz(50).ratingMva(3000).inertiaS(5).dampingMwPerHz(30).kMwPerHz(1000);
        b.unit("reheat", "a").reheat(0.3, 7, 0.3).governorTimeConstantS(0.2).ratingMw(600).droopPct(5).initialOutputMw(300);
        b.unit("plain", "a").nonReheat(0.4).governorTimeConstantS(0.2).ratingMw(400).droopPct(5).initialOutputMw(200);
        b.unit("hydro", "a").hydro(2, 43, 9).governorTimeConstantS(0.5).ratingMw(500).droopPct(5).initialOutputMw(250);
        b.load("l", "a").baseMw(750);
        Grid grid = b.build();
        GridSimulator exact = new GridSimulator(grid, 0.02, 0, 0, Integrator.EXACT);
        GridSimulator rk4 = new GridSimulator(grid, 0.002, 0, 0, Integrator.RK4);
        exact.stepLoadMw("a", 40);
        rk4.stepLoadMw("a", 40);
        double worstMw = 0;
        for (int s = 1; s <= 60; s++) {
            exact.advanceTo(s);
            rk4.advanceTo(s);
            for (int u = 0; u < grid.units().size(); u++) {
                worstMw = Math.max(worstMw, Math.abs(exact.outputMw(u) - rk4.outputMw(u)));
                worstMw = Math.max(worstMw, Math.abs(exact.valvePositionMw(u) - rk4.valvePositionMw(u)));
            }
        }
        // both are fourth order; at these steps each is far within 1e-4 MW of the exact solution
        assertThat(worstMw).isLessThan(1e-4);
        assertThat(exact.frequencyDeviationHz(0)).isCloseTo(rk4.frequencyDeviationHz(0), within(1e-7));
        assertThat(exact.outputMw("hydro")).isGreaterThan(251);
    }
}
