package org.loopstand.controller.allocation;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.loopstand.controller.dispatch.QuadraticCostUnit;

class TertiaryRedispatchTest {
    @Test
    void shouldWalkBasePointsToNewDispatchAtRamp() {
        // equal costs: the dispatch splits 300 MW evenly
        List<QuadraticCostUnit> costs = List.of(new QuadraticCostUnit("U1", 0, 10, 0.01, 50, 250),
                new QuadraticCostUnit("U2", 0, 10, 0.01, 50, 250));
        TertiaryRedispatch t = new TertiaryRedispatch(300_000, 1.0, costs);
        assertThat(t.due(0)).isTrue();
        t.redispatch(0, 300);
        assertThat(t.due(299_999)).isFalse();
        assertThat(t.due(300_000)).isTrue();
        List<UnitState> units = List.of(RegulationAllocatorTest.unit("U1", 180, 50, 250, 30),
                RegulationAllocatorTest.unit("U2", 120, 50, 250, 30));
        Map<String, Double> base = new HashMap<>(Map.of("U1", 180.0, "U2", 120.0));
        for (int i = 0; i < 100; i++) {
            Map<String, Double> next = t.stepBasePoints(base, units, 4.0);
            assertThat(Math.abs(next.get("U1") - base.get("U1"))).isLessThanOrEqualTo(2.0 + 1e-12);
            base = new HashMap<>(next);
        }
        assertThat(base.get("U1")).isCloseTo(150, within(1e-9));
        assertThat(base.get("U2")).isCloseTo(150, within(1e-9));
    }

    @Test
    void shouldDispatchOnlyTheEligibleUnitsWithinTheirLiveLimits() {
        // three equal-cost units of 50–250 MW; U3 is out of the allocation. The two eligible ones are
        // asked for 90 MW in all: with U3's 50 MW minimum in the dispatch that would look infeasible
        // (Σ min 150 MW); over the eligible units it is 45 MW each.
        List<QuadraticCostUnit> costs = List.of(new QuadraticCostUnit("U1", 0, 10, 0.01, 40, 250),
                new QuadraticCostUnit("U2", 0, 10, 0.01, 40, 250), new QuadraticCostUnit("U3", 0, 10, 0.01, 50, 250));
        TertiaryRedispatch t = new TertiaryRedispatch(300_000, 1.0, costs);
        List<UnitState> eligible = List.of(RegulationAllocatorTest.unit("U1", 50, 40, 250, 30),
                RegulationAllocatorTest.unit("U2", 40, 40, 250, 30));
        var d = t.redispatch(0, eligible);
        assertThat(d.demandMw()).isCloseTo(90, within(1e-9));
        assertThat(d.outputMw()).containsOnlyKeys("U1", "U2");
        assertThat(d.outputMw("U1")).isCloseTo(45, within(1e-6));
        // live regulating limits bind: U2 may not go above 42 MW now, so U1 takes the rest
        List<UnitState> limited = List.of(RegulationAllocatorTest.unit("U1", 50, 40, 250, 30),
                RegulationAllocatorTest.unit("U2", 40, 40, 42, 30));
        var e = t.redispatch(300_000, limited);
        assertThat(e.outputMw("U2")).isCloseTo(42, within(1e-6));
        assertThat(e.outputMw("U1")).isCloseTo(48, within(1e-6));
        assertThat(e.atLimit()).containsExactly("U2");
    }
}
