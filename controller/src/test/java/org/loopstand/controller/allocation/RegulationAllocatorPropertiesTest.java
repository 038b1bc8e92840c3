package org.loopstand.controller.allocation;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;

class RegulationAllocatorPropertiesTest {
    /** Nothing is lost: shares plus what nobody could take equal the level; every share is in range. */
    @Property(tries = 300)
    void shouldConserveLevelAndRespectRanges(@ForAll @IntRange(min = 1, max = 8) int n,
                                             @ForAll @DoubleRange(min = -500, max = 500) double levelMw,
                                             @ForAll @IntRange(min = 0, max = 1_000_000) int seed) {
        java.util.Random rnd = new java.util.Random(seed);
        List<UnitState> units = new ArrayList<>();
        Map<String, Double> base = new HashMap<>();
        Map<String, Double> pf = new HashMap<>();
        for (int i = 0; i < n; i++) {
            double min = rnd.nextDouble() * 100;
            double max = min + rnd.nextDouble() * 200;
            double b = min + rnd.nextDouble() * (max - min);
            String id = "U" + i;
            units.add(RegulationAllocatorTest.unit(id, b, min, max, 1e6));
            base.put(id, b);
            pf.put(id, rnd.nextInt(4) == 0 ? 0.0 : rnd.nextDouble());
        }
        Allocation a = new RegulationAllocator(4).allocate(levelMw, units, base, pf, List.of());
        double shares = a.units().stream().mapToDouble(UnitAllocation::shareMw).sum();
        assertThat(shares + a.unallocatedMw()).isCloseTo(levelMw, within(1e-6));
        for (UnitAllocation ua : a.units()) {
            UnitState u = units.stream().filter(x -> x.unitId().equals(ua.unitId())).findFirst().orElseThrow();
            assertThat(ua.targetMw()).isBetween(u.regulatingMinMw() - 1e-9, u.regulatingMaxMw() + 1e-9);
        }
        if (Math.abs(a.unallocatedMw()) > 1e-9) {
            assertThat(Math.signum(a.unallocatedMw())).isEqualTo(Math.signum(levelMw));
        }
    }
}
