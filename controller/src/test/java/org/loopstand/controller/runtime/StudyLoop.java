package org.loopstand.controller.runtime;

import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Closed loop in study mode: plant physics and the controller agent on one synchronous test bus,
 * driven by one virtual clock in 100 ms slices; the plant publishes every second.
 */
final class StudyLoop {
    static final long START_MS = 1_700_000_000_000L;
    static final long SLICE_MS = 100;

    final VirtualClock clock = new VirtualClock(START_MS);
    final TestBus broker = new TestBus();
    final GridSimulator sim;
    final StudyPlantAdapter plant;
    final ControllerAgent agent;
    final TestBus.Connection controllerLink;

    StudyLoop(GridSimulator sim, ControllerSiteConfig config) {
        this.sim = sim;
        this.plant = new StudyPlantAdapter(sim, broker.connect("plant"), clock);
        this.controllerLink = broker.connect("controller");
        this.agent = new ControllerAgent(config, controllerLink, clock, null, "controller-1", START_MS,
                null, null);
        agent.onStart();
    }

    static TestBus.Connection controllerConnection(StudyLoop loop) {
        return loop.controllerLink;
    }

    /** Runs until {@code untilS} of virtual time. */
    void runTo(double untilS) {
        while (clock.elapsedSeconds() < untilS - 1e-9) {
            clock.advanceMillis(SLICE_MS);
            plant.advanceTo(clock.epochMillis(), clock.elapsedSeconds());
            if (clock.monotonicNanos() % 1_000_000_000L == 0) {
                plant.publishScan();
            }
            agent.doWork();
        }
    }
}
