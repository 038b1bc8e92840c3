package org.loopstand.controller.runtime;

import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.topic.TopicTree;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.time.VirtualClock;

/**
 * Closed loop in study mode: plant physics and the controller agent on the in-memory broker (DIRECT delivery),
 * driven by one virtual clock in 100 ms slices; the plant publishes every second.
 */
final class StudyLoop {
    static final long START_MS = 1_700_000_000_000L;
    static final long SLICE_MS = 100;

    final VirtualClock clock = new VirtualClock(START_MS);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    /** every message the controller published, in order (its own subscription to the whole site) */
    final java.util.List<InboundMessage> published = new java.util.concurrent.CopyOnWriteArrayList<>();
    final GridSimulator sim;
    final StudyPlantAdapter plant;
    final ControllerAgent agent;
    final InMemoryBus controllerLink;

    StudyLoop(GridSimulator sim, ControllerSiteConfig config) {
        this.sim = sim;
        InMemoryBus plantLink = broker.connect("plant");
        this.plant = new StudyPlantAdapter(sim, plantLink, clock);
        broker.connect("recorder").subscribe(TopicTree.forSite(sim.grid().siteId()).filterEverything(), Qos.AT_LEAST_ONCE,
                m -> {
                    if (m.topic().endsWith("/command") || m.topic().contains("/controller/")) {
                        published.add(m);
                    }
                });
        this.controllerLink = broker.connect("controller", ControllerAgent.offlineStatus(sim.grid().siteId(),
                "controller-1", START_MS, START_MS));
        this.agent = new ControllerAgent(config, controllerLink, clock, null, "controller-1", START_MS,
                null, null);
        agent.onStart();
    }

    static InMemoryBus controllerConnection(StudyLoop loop) {
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
