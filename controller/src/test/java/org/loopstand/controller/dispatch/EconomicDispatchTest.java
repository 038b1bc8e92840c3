package org.loopstand.controller.dispatch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

class EconomicDispatchTest {
    // Wood & Wollenberg, Power Generation, Operation, and Control, Example 3A (from memory).
    // Unit 1 fuel 1.1 $/MBtu: C1 = 561 + 7.92P + 0.001562P^2; C2 = 310 + 7.85P + 0.00194P^2;
    // C3 = 78 + 7.97P + 0.00482P^2. Re-derived at 850 MW:
    // sum 1/(2c) = 320.10 + 257.73 + 103.73 = 681.57; sum b/(2c) = 5385.2;
    // lambda = (850 + 5385.2)/681.57 = 9.148; P = 393.2 / 334.6 / 122.2 MW.
    static final List<QuadraticCostUnit> EXAMPLE_3A = List.of(
            QuadraticCostUnit.fromHeatRate("U1", 510, 7.2, 0.00142, 1.1, 150, 600),
            QuadraticCostUnit.fromHeatRate("U2", 310, 7.85, 0.00194, 1.0, 100, 400),
            QuadraticCostUnit.fromHeatRate("U3", 78, 7.97, 0.00482, 1.0, 50, 200));

    @Test
    void shouldReproduceThreeUnitExample() {
        DispatchResult r = EconomicDispatch.solve(EXAMPLE_3A, 850);
        assertThat(r.lambdaDollarPerMwh()).isCloseTo(9.148, within(0.0005));
        assertThat(r.outputMw("U1")).isCloseTo(393.2, within(0.1));
        assertThat(r.outputMw("U2")).isCloseTo(334.6, within(0.1));
        assertThat(r.outputMw("U3")).isCloseTo(122.2, within(0.1));
        assertThat(r.atLimit()).isEmpty();
        double total = r.outputMw().values().stream().mapToDouble(Double::doubleValue).sum();
        assertThat(total).isCloseTo(850, within(1e-9));
    }

    @Test
    void shouldLandOnNewDispatchWhenMovingByParticipationFactors() {
        // Wood & Wollenberg, base point and participation factor method (from memory):
        // exact for quadratic costs while no limit is hit.
        DispatchResult base = EconomicDispatch.solve(EXAMPLE_3A, 850);
        ParticipationFactors pf = ParticipationFactors.of(EXAMPLE_3A, base);
        assertThat(pf.of("U1")).isCloseTo(320.10 / 681.57, within(1e-4));
        Map<String, Double> moved = pf.move(base.outputMw(), 50);
        DispatchResult at900 = EconomicDispatch.solve(EXAMPLE_3A, 900);
        for (String id : List.of("U1", "U2", "U3")) {
            assertThat(moved.get(id)).as(id).isCloseTo(at900.outputMw(id), within(1e-6));
        }
    }

    @Test
    void shouldHoldUnitsAtLimitsAndShareTheRest() {
        // U3 pinned at 200 MW max when demand is high: at 1150 MW the free lambda would push U3 past 200
        DispatchResult r = EconomicDispatch.solve(EXAMPLE_3A, 1150);
        double sum = r.outputMw().values().stream().mapToDouble(Double::doubleValue).sum();
        assertThat(sum).isCloseTo(1150, within(1e-6));
        for (QuadraticCostUnit u : EXAMPLE_3A) {
            double p = r.outputMw(u.unitId());
            assertThat(p).isBetween(u.minMw(), u.maxMw());
            if (!r.atLimit().contains(u.unitId())) {
                assertThat(u.incrementalCostDollarPerMwh(p)).isCloseTo(r.lambdaDollarPerMwh(), within(1e-9));
            }
        }
        // at the minimum of all units every unit sits at its lower limit
        DispatchResult low = EconomicDispatch.solve(EXAMPLE_3A, 300);
        assertThat(low.atLimit()).containsExactlyInAnyOrder("U1", "U2", "U3");
        ParticipationFactors pf = ParticipationFactors.of(EXAMPLE_3A, Set.of("U3"));
        assertThat(pf.of("U3")).isZero();
        assertThat(pf.of("U1") + pf.of("U2")).isCloseTo(1.0, within(1e-12));
    }

    @Test
    void shouldRejectInfeasibleDemand() {
        assertThatThrownBy(() -> EconomicDispatch.solve(EXAMPLE_3A, 1300))
                .isInstanceOf(InfeasibleDispatchException.class)
                .hasMessageContaining("1300").hasMessageContaining("300.0 to 1200.0");
        assertThatThrownBy(() -> EconomicDispatch.solve(EXAMPLE_3A, 200)).isInstanceOf(InfeasibleDispatchException.class);
    }
}
