package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Map;

import org.junit.jupiter.api.Test;

class PlantFaultFlagsTest {
    private final FaultRig rig = new FaultRig();
    private final PlantFaultFlags flags = rig.engine.plantFlags(FaultRig.UNIT);

    private void at(double s) {
        rig.clock.advanceMillis(Math.round(s * 1000) - (rig.clock.epochMillis() - FaultRig.START_MS));
        rig.engine.update();
    }

    @Test
    void shouldRaiseEachPlantFlagOnlyInsideItsWindow() {
        rig.fault("p1", "ignorePulses", FaultRig.UNIT, Map.of(), 10, 20);
        rig.fault("p2", "slowResponse", FaultRig.UNIT, Map.of("slowFactor", 5), 10, 20);
        rig.fault("p3", "swapRaiseLower", FaultRig.UNIT, Map.of(), 10, 20);
        rig.fault("p4", "switchToLocal", FaultRig.UNIT, Map.of(), 10, 20);
        rig.fault("p5", "applyExpired", FaultRig.UNIT, Map.of(), 10, 20);
        at(5);
        assertThat(flags.ignorePulses() || flags.swapRaiseLower() || flags.forcedLocal() || flags.applyExpiredCommands()).isFalse();
        assertThat(flags.slowFactor()).isEqualTo(1.0);
        at(12);
        assertThat(flags.ignorePulses() && flags.swapRaiseLower() && flags.forcedLocal() && flags.applyExpiredCommands()).isTrue();
        assertThat(flags.slowFactor()).isEqualTo(5.0);
        assertThat(rig.engine.plantFlags("basin-steam-1").ignorePulses()).isFalse();
        at(20);
        assertThat(flags.ignorePulses() || flags.swapRaiseLower() || flags.forcedLocal() || flags.applyExpiredCommands()).isFalse();
    }

    @Test
    void shouldKeepATripOrderedAfterItsWindowEnds() {
        rig.fault("p1", "plantTrip", FaultRig.UNIT, Map.of(), 10, 11);
        at(9);
        assertThat(flags.tripRequested()).isFalse();
        at(30); // start and end fire in one update
        assertThat(flags.tripRequested()).isTrue();
        assertThat(rig.transitions).containsExactly("start p1 at 30000", "stop p1 at 30000");
    }

    @Test
    void shouldReadTheFlagsAfterEveryStepWithoutAllocating() {
        rig.fault("p2", "slowResponse", FaultRig.UNIT, Map.of("slowFactor", 5), 10, 20);
        at(12);
        var threads = (com.sun.management.ThreadMXBean) java.lang.management.ManagementFactory.getThreadMXBean();
        long id = Thread.currentThread().getId();
        double sum = readAll(1_000) + threads.getThreadAllocatedBytes(id); // the first reads and the meter's own first call
        long before = threads.getThreadAllocatedBytes(id);
        sum += readAll(100_000);
        long allocatedBytes = threads.getThreadAllocatedBytes(id) - before;
        // was a list and a stream per flag read (≥ 100 bytes each, so ≥ 50 MB here); now only when a fault starts or ends
        assertThat(allocatedBytes).isLessThan(1_000);
        assertThat(sum).isGreaterThan(0);
        at(20);
        assertThat(flags.slowFactor()).isEqualTo(1.0); // the end of the window is still seen
    }

    /** What a unit interface reads after each step, {@code n} times. */
    private double readAll(int n) {
        double s = 0;
        for (int i = 0; i < n; i++) {
            s += flags.slowFactor();
            s += flags.forcedLocal() ? 1 : 0;
            s += flags.tripRequested() ? 1 : 0;
            s += flags.ignorePulses() || flags.swapRaiseLower() || flags.applyExpiredCommands() ? 1 : 0;
        }
        return s;
    }
}
