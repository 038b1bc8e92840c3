package org.loopstand.controller.runtime;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.concurrent.CopyOnWriteArrayList;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Closed loop in study mode: the real plant process ({@link PlantRunner}: physics, area meters,
 * unit plant interfaces) and the controller agent on one in-memory broker (DIRECT delivery), both
 * stepped by hand on one virtual clock in {@value #SLICE_MS} ms slices: deterministic, no threads.
 * Meters and telemetry use the plant's defaults (2 s scan, 1 mHz / 0.5 MW noise). The plant's own
 * connection goes through a {@link MeterTap} so tests can silence or falsify meters.
 */
final class StudyLoop {
    static final long START_MS = 1_700_000_000_000L;
    static final long SLICE_MS = 20;
    /** a second desk the units also obey (same epoch), to move a unit behind the controller's back */
    static final String OPERATOR = "operator";

    final VirtualClock clock = new VirtualClock(START_MS);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
    /** every command and controller status on the bus, in order */
    final List<InboundMessage> published = new CopyOnWriteArrayList<>();
    /** every ack the units sent */
    final List<CommandAck> acks = new CopyOnWriteArrayList<>();
    final GridSimulator sim;
    final PlantRunner plant;
    final MeterTap tap;
    final ControllerAgent agent;
    final InMemoryBus controllerLink;
    private final MessageCodec codec = new MessageCodec();
    private final TopicTree topics;
    private final InMemoryBus operator;
    private long operatorSeq;

    StudyLoop(GridSimulator sim, ControllerSiteConfig config) {
        this(sim, config, List.of());
    }

    StudyLoop(GridSimulator sim, ControllerSiteConfig config, List<ScenarioEvent> events) {
        this(sim, config, events, null);
    }

    /** @param journal the controller's journal (owned and closed by the agent), or null */
    StudyLoop(GridSimulator sim, ControllerSiteConfig config, List<ScenarioEvent> events, JournalWriter journal) {
        this(sim, config, events, journal, bus -> bus);
    }

    /** @param controllerBus wraps the controller's connection (to make it fail in a test) */
    StudyLoop(GridSimulator sim, ControllerSiteConfig config, List<ScenarioEvent> events, JournalWriter journal,
              java.util.function.UnaryOperator<org.loopstand.protocol.bus.MessageBus> controllerBus) {
        this.sim = sim;
        this.topics = TopicTree.forSite(sim.grid().siteId());
        broker.connect("recorder").subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, m -> {
            if (m.topic().endsWith("/command") || m.topic().contains("/controller/")) {
                published.add(m);
            } else if (m.topic().endsWith("/ack")) {
                acks.add(codec.decode(m.payload(), CommandAck.class).message().orElseThrow());
            }
        });
        List<MeterSettings> meters = new ArrayList<>();
        for (Area a : sim.grid().areas()) {
            meters.add(MeterSettings.defaults(a.id()));
        }
        PlantOptions options = new PlantOptions(1.0, Set.of(), ConnectionGrouping.PER_UNIT, 1, meters,
                InterfaceOptions.defaults().withAcceptedControllers(Set.of("controller-1", OPERATOR)),
                Qos.AT_MOST_ONCE, 256, 7, 1.0);
        MeterTap[] tapHolder = new MeterTap[1];
        this.plant = new PlantRunner(sim, events, options, (clientId, will) -> {
            InMemoryBus b = broker.connect(clientId, will);
            if (clientId.endsWith("-plant")) {
                tapHolder[0] = new MeterTap(b);
                return tapHolder[0];
            }
            return b;
        }, clock, w -> { });
        this.tap = tapHolder[0];
        this.operator = broker.connect(OPERATOR);
        this.controllerLink = broker.connect("controller", OfflineStatus.will(sim.grid().siteId(),
                "controller-1", START_MS, START_MS));
        this.agent = new ControllerAgent(config, controllerBus.apply(controllerLink), clock, null, "controller-1",
                START_MS, journal, null);
        agent.onStart();
    }

    static InMemoryBus controllerConnection(StudyLoop loop) {
        return loop.controllerLink;
    }

    /** Runs until {@code untilS} of virtual time after the start. */
    void runTo(double untilS) {
        while (clock.elapsedSeconds() < untilS - 1e-9) {
            clock.advanceMillis(SLICE_MS);
            plant.agent().doWork();
            agent.doWork();
        }
    }

    /** Commands the units accepted (by their acks), in order. */
    List<CommandAck> accepted() {
        return acks.stream().filter(a -> a.outcome() == AckOutcome.ACCEPTED).toList();
    }

    List<CommandAck> refused() {
        return acks.stream().filter(a -> a.outcome() == AckOutcome.REJECTED).toList();
    }

    /** Commands the controller sent, decoded, in order. */
    List<UnitCommand> commands() {
        return published.stream().filter(m -> m.topic().endsWith("/command"))
                .map(m -> codec.decode(m.payload(), UnitCommand.class).message().orElseThrow()).toList();
    }

    /** A raise or lower pulse from the second desk, outside the controller's knowledge. */
    void operatorPulse(String unit, org.loopstand.protocol.message.PulseDirection direction, long durationMs) {
        long now = clock.epochMillis();
        UnitCommand c = UnitCommand.pulse(++operatorSeq, now, unit, OPERATOR, START_MS, now + 4_000, direction,
                durationMs);
        operator.publish(OutboundMessage.of(topics.unitCommand(unit), codec.encode(c), Qos.AT_LEAST_ONCE));
    }
}
