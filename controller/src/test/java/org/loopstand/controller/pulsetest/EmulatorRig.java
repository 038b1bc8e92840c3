package org.loopstand.controller.pulsetest;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.plan.TestPlanLoader;
import org.loopstand.controller.pulsetest.programme.SiteUnitReader;
import org.loopstand.controller.pulsetest.safety.AbortSwitch;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The real plant (physics, plant interfaces, meters) of the demo site on the in-memory broker and a
 * virtual clock, with the pulse-test runner on its own connection: deterministic and fast.
 *
 * <p>The grid starts at 10:30, where both areas' daily load shapes are flat at 1.00 and the demo site's
 * generation (2800 MW) meets its load (2800 MW): frequency stays near 50 Hz, so a unit with a governor
 * dead band of 10 mHz hardly answers frequency while it is tested. At hour 0 the site starts 594 MW
 * long and the frequency settles about 0.35 Hz high, where every governor acts (see the gain check).
 */
final class EmulatorRig implements AutoCloseable {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final Path PLANS = Path.of("..", "config", "plans");
    /** Plant loop cadence: the plant and the runner run every 10 ms of virtual time. */
    static final long TICK_MS = 10;

    final VirtualClock clock = new VirtualClock(1_767_225_600_000L);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    final TopicTree topics = TopicTree.forSite("demo-site");
    final PlantRunner plant;
    final TestPlan plan;
    final String unitId;
    PulseTestRunner runner;

    /**
     * @param unitId          unit to test
     * @param planFile        plan in config/plans
     * @param startHourOfDay  time of day at the start, h (load shapes)
     * @param telemetryScanMs telemetry scan period of every unit, ms
     */
    EmulatorRig(String unitId, String planFile, double startHourOfDay, long telemetryScanMs, boolean quietLoads)
            throws Exception {
        this.unitId = unitId;
        this.plan = TestPlanLoader.load(PLANS.resolve(planFile));
        Grid grid = quietLoads ? quietDemoSite() : SiteLoader.load(SITE);
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 42, startHourOfDay);
        PlantOptions o = new PlantOptions(1.0, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")),
                InterfaceOptions.defaults().withTelemetryScanMs(telemetryScanMs, Map.of())
                        .withAcceptedControllers(Set.of(InterfaceOptions.DEFAULT_CONTROLLER, PulseTestRunner.CONTROLLER_ID)),
                Qos.AT_MOST_ONCE, 256, 7, 5.0);
        plant = new PlantRunner(sim, List.of(), o, broker::connect, clock, w -> { });
    }

    /**
     * The demo site with its loads' random noise switched off (every other figure as shipped): the
     * frequency then moves only with the tested unit's own pulses.
     */
    static Grid quietDemoSite() throws java.io.IOException {
        return SiteLoader.load(SITE).withoutLoadNoise(); // what `./loopstand plant --quiet-loads` runs
    }

    UnitPlantInterface unit() {
        return plant.unitCycle(unitId).unit();
    }

    /** Runs the plant alone for {@code s} seconds of virtual time (lets the governors settle). */
    EmulatorRig settle(double s) {
        for (long i = 0, n = Math.round(s * 1000 / TICK_MS); i < n; i++) {
            clock.advanceMillis(TICK_MS);
            plant.agent().doWork();
        }
        return this;
    }

    /** Runs the plan to its end (bounded by its duration cap) and judges it. */
    PulseTestResult run() {
        var site = SiteUnitReader.read(SITE, unitId);
        runner = new PulseTestRunner(broker.connect("pulse-test"), clock, topics, unitId, plan, site.unit(),
                plan.limits(), 1, AbortSwitch.NEVER, 30).removeGovernorAnswer(site.governor());
        runner.onStart();
        long bound = Math.round(plan.limits().maxDurationS() * 1000 / TICK_MS) + 1000;
        for (long i = 0; i < bound && !runner.isDone(); i++) {
            clock.advanceMillis(TICK_MS);
            plant.agent().doWork();
            runner.doWork();
        }
        runner.onClose();
        return PulseTestEvaluator.evaluate(runner.record(), plan);
    }

    @Override
    public void close() {
        plant.close();
    }
}
