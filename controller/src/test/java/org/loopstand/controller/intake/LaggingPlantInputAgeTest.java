package org.loopstand.controller.intake;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.junit.jupiter.api.Test;
import org.loopstand.controller.allocation.UnitState;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.VirtualClock;

/**
 * The real plant (physics, meters, unit interfaces) and the controller's real intake on one virtual
 * clock: when the plant's physics falls behind its clock, what it publishes is as old as the physics,
 * and the intake's age checks say so. Deterministic: the clock is moved by hand, one plant pass steps at
 * most 250 physics steps (5 s of the demo site's 20 ms steps).
 */
class LaggingPlantInputAgeTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final long T0 = 1_700_000_000_000L;
    final VirtualClock clock = new VirtualClock(T0);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);

    @Test
    void shouldFindMetersAndTelemetryStaleWhenThePlantsPhysicsLagsItsClock() throws Exception {
        GridSimulator sim = new GridSimulator(SiteLoader.load(SITE));
        PlantOptions o = new PlantOptions(1.0, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")),
                InterfaceOptions.defaults().withTelemetryScanMs(2_000, Map.of()), Qos.AT_MOST_ONCE, 256, 7, 1.0);
        IntakeRouter router = new IntakeRouter(ControllerSiteReader.read(SITE), clock, new MessageCodec(), null);
        var controllerLink = broker.connect("controller");
        router.subscriptions().forEach(f -> controllerLink.subscribe(f, Qos.AT_LEAST_ONCE, router.listener()));
        try (PlantRunner plant = new PlantRunner(sim, List.of(), o, broker::connect, clock, w -> { })) {
            for (int i = 0; i < 100; i++) { // 10 s in step with the clock
                clock.advanceMillis(100);
                plant.agent().doWork();
            }
            router.drain();
            long nowMs = clock.epochMillis();
            ValidatedValue fresh = router.areaInputs("north-basin", nowMs).frequencyHz();
            assertThat(fresh.usable()).isTrue();
            assertThat(fresh.reasons()).isEmpty();
            assertThat(fresh.ageMs()).isEqualTo(0); // the 2 s scan at 10 s, read from the physics at 10 s
            assertThat(unit(router.unitStates(nowMs), "ridge-hydro-1").telemetryGood()).isTrue();

            clock.advanceMillis(20_000); // the loop stalled 20 s: its next pass steps 5 s of physics
            plant.agent().doWork();
            router.drain();
            nowMs = clock.epochMillis();
            assertThat(sim.timeS()).isEqualTo(15.0, org.assertj.core.api.Assertions.within(1e-9));

            // frequency: 15 s old > maxAgeMs 10 s (ControllerSettings default) -> stale, held (hold 8 s)
            ValidatedValue f = router.areaInputs("north-basin", nowMs).frequencyHz();
            assertThat(f.ageMs()).isEqualTo(15_000);
            assertThat(f.reasons()).contains(ValidationReason.STALE, ValidationReason.HELD_LAST_GOOD);
            assertThat(f.held()).isTrue();
            ValidatedValue tie = router.areaInputs("south-ridge", nowMs).tieFlowsMw().get("basin-ridge");
            assertThat(tie.ageMs()).isEqualTo(15_000);
            assertThat(tie.reasons()).contains(ValidationReason.STALE);
            // unit telemetry: read after the pass's first step (10.02 s), 19.98 s old > 10 s -> not eligible
            UnitState hydro = unit(router.unitStates(nowMs), "ridge-hydro-1");
            assertThat(hydro.telemetryTimeMs()).isEqualTo(T0 + 10_020);
            assertThat(hydro.telemetryGood()).isFalse();
            assertThat(router.telemetryCheck("ridge-hydro-1").evaluate(nowMs).reasons()).contains(ValidationReason.STALE);
        }
    }

    static UnitState unit(List<UnitState> states, String id) {
        return states.stream().filter(u -> u.unitId().equals(id)).findFirst().orElseThrow();
    }
}
