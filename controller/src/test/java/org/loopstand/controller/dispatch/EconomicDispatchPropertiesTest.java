package org.loopstand.controller.dispatch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;

class EconomicDispatchPropertiesTest {
    /**
     * Optimality conditions of equal incremental cost with limits: the outputs add up to the
     * demand, free units sit at λ, units at max have incremental cost ≤ λ, units at min ≥ λ.
     */
    @Property(tries = 300)
    void shouldMeetDemandAndEqualIncrementalCostConditions(@ForAll @IntRange(min = 1, max = 6) int n,
                                                           @ForAll @DoubleRange(min = 0, max = 1) double loadShare,
                                                           @ForAll @IntRange(min = 0, max = 1_000_000) int seed) {
        java.util.Random rnd = new java.util.Random(seed);
        List<QuadraticCostUnit> units = new ArrayList<>();
        double minTotal = 0;
        double maxTotal = 0;
        for (int i = 0; i < n; i++) {
            double min = 20 + rnd.nextDouble() * 100;
            double max = min + 10 + rnd.nextDouble() * 400;
            units.add(new QuadraticCostUnit("U" + i, rnd.nextDouble() * 500, 5 + rnd.nextDouble() * 10,
                    0.0005 + rnd.nextDouble() * 0.01, min, max));
            minTotal += min;
            maxTotal += max;
        }
        double demand = minTotal + loadShare * (maxTotal - minTotal);
        DispatchResult r = EconomicDispatch.solve(units, demand);
        double sum = r.outputMw().values().stream().mapToDouble(Double::doubleValue).sum();
        assertThat(sum).isCloseTo(demand, within(1e-6));
        double lambda = r.lambdaDollarPerMwh();
        for (QuadraticCostUnit u : units) {
            double p = r.outputMw(u.unitId());
            assertThat(p).isBetween(u.minMw() - 1e-9, u.maxMw() + 1e-9);
            double ic = u.incrementalCostDollarPerMwh(p);
            if (p >= u.maxMw() - 1e-6) {
                assertThat(ic).isLessThanOrEqualTo(lambda + 1e-6);
            } else if (p <= u.minMw() + 1e-6) {
                assertThat(ic).isGreaterThanOrEqualTo(lambda - 1e-6);
            } else {
                assertThat(ic).isCloseTo(lambda, within(1e-6));
            }
        }
    }
}
