package org.loopstand.controller.allocation;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

class RegulationAllocatorTest {
    static UnitState unit(String id, double setpointMw, double minMw, double maxMw, double rampMwPerMin) {
        return new UnitState(id, "A", true, true, true, setpointMw, setpointMw, minMw, maxMw, rampMwPerMin, rampMwPerMin,
                false, 0);
    }

    private final RegulationAllocator allocator = new RegulationAllocator(4.0);

    private static UnitAllocation of(Allocation a, String id) {
        return a.units().stream().filter(u -> u.unitId().equals(id)).findFirst().orElseThrow();
    }

    @Test
    void shouldShareByParticipationFactors() {
        List<UnitState> units = List.of(unit("U1", 100, 50, 200, 600), unit("U2", 100, 50, 200, 600));
        Allocation a = allocator.allocate(30, units, Map.of("U1", 100.0, "U2", 100.0), Map.of("U1", 0.75, "U2", 0.25),
                List.of());
        assertThat(of(a, "U1").shareMw()).isCloseTo(22.5, within(1e-9));
        assertThat(of(a, "U2").shareMw()).isCloseTo(7.5, within(1e-9));
        assertThat(of(a, "U1").targetMw()).isCloseTo(122.5, within(1e-9));
        assertThat(a.unallocatedMw()).isZero();
    }

    @Test
    void shouldPassShareOfUnitAtLimitToOthers() {
        // U1 can give only 5 MW more (max 105); its 0.5 share of 40 MW = 20 MW is cut to 5, the 15 MW
        // left goes to U2 and U3 in their ratio 0.3 : 0.2
        List<UnitState> units = List.of(unit("U1", 100, 50, 105, 600), unit("U2", 100, 50, 200, 600),
                unit("U3", 100, 50, 200, 600));
        Map<String, Double> base = Map.of("U1", 100.0, "U2", 100.0, "U3", 100.0);
        Allocation a = allocator.allocate(40, units, base, Map.of("U1", 0.5, "U2", 0.3, "U3", 0.2), List.of());
        assertThat(of(a, "U1").shareMw()).isCloseTo(5, within(1e-9));
        assertThat(of(a, "U1").limitedBy()).isEqualTo(LimitedBy.REGULATING_RANGE);
        assertThat(of(a, "U2").shareMw()).isCloseTo(35 * 0.6, within(1e-9));
        assertThat(of(a, "U3").shareMw()).isCloseTo(35 * 0.4, within(1e-9));
        double total = a.units().stream().mapToDouble(UnitAllocation::shareMw).sum();
        assertThat(total).isCloseTo(40, within(1e-9));
    }

    @Test
    void shouldReportUnallocatedWhenAllAtLimits() {
        List<UnitState> units = List.of(unit("U1", 100, 50, 110, 600), unit("U2", 100, 50, 120, 600));
        Allocation a = allocator.allocate(50, units, Map.of("U1", 100.0, "U2", 100.0), Map.of("U1", 0.5, "U2", 0.5),
                List.of());
        assertThat(a.unallocatedMw()).isCloseTo(20, within(1e-9));
        assertThat(a.highMw()).isCloseTo(30, within(1e-9));
    }

    @Test
    void shouldLimitMoveToRampPerCycle() {
        // 30 MW/min over a 4 s cycle = 2 MW per cycle
        List<UnitState> units = List.of(unit("U1", 100, 50, 200, 30));
        Allocation a = allocator.allocate(10, units, Map.of("U1", 100.0), Map.of("U1", 1.0), List.of());
        assertThat(of(a, "U1").deltaMw()).isCloseTo(2, within(1e-9));
        assertThat(of(a, "U1").limitedBy()).isEqualTo(LimitedBy.RAMP);
    }

    @Test
    void shouldMoveEveryUnitAtFullRateInAssistBand() {
        List<UnitState> units = List.of(unit("U1", 100, 50, 200, 30), unit("U2", 100, 50, 101, 60));
        Allocation a = allocator.assist(+1, units, Map.of("U1", 100.0, "U2", 100.0), List.of());
        assertThat(of(a, "U1").deltaMw()).isCloseTo(2, within(1e-9));
        assertThat(of(a, "U2").deltaMw()).isCloseTo(1, within(1e-9));
    }

    @Test
    void shouldExcludeIneligibleUnits() {
        List<UnitState> all = List.of(unit("U1", 100, 50, 200, 30),
                new UnitState("U2", "A", false, true, true, 100, 100, 50, 200, 30, 30, false, 0),
                new UnitState("U3", "A", true, true, false, 100, 100, 50, 200, 30, 30, false, 0),
                new UnitState("U4", "A", true, false, true, 100, 100, 50, 200, 30, 30, false, 0),
                unit("U5", 100, 50, 200, 30));
        List<String> excluded = new ArrayList<>();
        List<UnitState> eligible = RegulationAllocator.eligible(all, Set.of("U5"), excluded);
        assertThat(eligible).extracting(UnitState::unitId).containsExactly("U1");
        assertThat(excluded).containsExactly("U2:notInRemote", "U3:telemetryBad", "U4:offline", "U5:notFollowing");
    }
}
