package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;

import org.loopstand.plant.field.DirectTurbineField;
import org.loopstand.plant.field.FieldGateway;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.meter.AreaMeterPublisher;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.PhysicsEpoch;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.plant.unit.PlantJournal;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.plant.unit.UnitSettings;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Builds and runs a plant process: the plant connection (meters, clock, field topics, orders), one
 * connection per group of unit links as the grouping says, the {@link PlantAgent}, and optionally a
 * thread that drives it in real time. Tests can skip {@link #start()} and call
 * {@code agent().doWork()} after moving a virtual clock.
 */
public final class PlantRunner implements AutoCloseable {
    private final GridSimulator sim;
    private final PlantOptions options;
    private final LinkFactory links;
    private final Clock clock;
    private final TopicTree topics;
    private final MessageCodec codec = new MessageCodec();
    private final UnitDutyCycle.StatusDecoding statusDecoding = new UnitDutyCycle.StatusDecoding(codec);
    private final PlantJournal journal = new PlantJournal();
    private final List<MessageBus> buses = new ArrayList<>();
    private final Map<String, UnitDutyCycle> cycles = new LinkedHashMap<>();
    private final MessageBus plantBus;
    private final PlantAgent agent;
    private final StepLateness lateness;
    private final PhysicsEpoch physicsEpoch;
    private final PlantCounters counters = new PlantCounters();
    /** the physics side of the field topics, null when every unit interface runs in this process */
    private final FieldGateway field;
    private AgentRunner runner;
    private OperatorOrders orders;
    private org.loopstand.plant.journal.PlantRunJournal runJournal;

    /**
     * @param sim      the physics (owned by the runner's thread from now on)
     * @param events   scenario events, may be empty
     * @param warnings where the one-time lateness warning goes
     */
    public PlantRunner(GridSimulator sim, List<ScenarioEvent> events, PlantOptions options, LinkFactory links,
                       Clock clock, Consumer<String> warnings) {
        this.sim = sim;
        this.options = options;
        this.links = links;
        this.clock = clock;
        String site = sim.grid().siteId();
        this.topics = TopicTree.forSite(site);
        for (String u : options.remoteUnits()) {
            if (!sim.grid().hasUnit(u)) {
                throw new IllegalArgumentException("unit '" + u + "' is not in site " + site);
            }
        }
        // every measurement is stamped with the physics' time; the agent sets its time 0
        this.physicsEpoch = new PhysicsEpoch(sim);
        this.plantBus = track(links.connect(site + "-plant", null));
        List<GeneratingUnit> local = sim.grid().units().stream()
                .filter(u -> !options.remoteUnits().contains(u.id())).toList();
        Map<String, List<String>> plan = options.grouping().plan(site, local, options.poolSize());
        long seqStart = clock.epochMillis();
        for (var group : plan.entrySet()) {
            openGroup(group.getKey(), group.getValue(), seqStart);
        }
        List<AreaMeterPublisher> meters = new ArrayList<>();
        long start = clock.monotonicNanos();
        for (int i = 0; i < options.meters().size(); i++) {
            MeterSettings m = options.meters().get(i);
            meters.add(new AreaMeterPublisher(m, sim.grid(), options.seed() * 1_000 + i, start, seqStart));
        }
        this.field = options.remoteUnits().isEmpty() ? null
                : new FieldGateway(sim, physicsEpoch, plantBus, topics, codec, clock,
                        sim.grid().units().stream().map(GeneratingUnit::id).filter(options.remoteUnits()::contains).toList(),
                        FieldGateway.DEFAULT_PERIOD_MS).start();
        List<UnitDutyCycle> cycleList = List.copyOf(cycles.values());
        this.orders = new OperatorOrders(cycleList, codec).subscribe(plantBus, topics);
        this.lateness = new StepLateness(Math.round(options.lateWarnS() * 1e9), msg -> {
            warnings.accept(msg);
            PlantAgent a = this.agentOrNull();
            if (a != null) {
                a.noteEvent(Map.of("event", "fallingBehind", "lagS", lateness().currentNanos() / 1e9));
            }
        });
        this.agent = new PlantAgent(new PlantAgent.Parts(sim, clock, plantBus, topics, codec, meters, cycleList, field,
                orders, events, options.rate(), lateness, physicsEpoch));
        journal.tap(counters);
        agent.countInto(counters);
        cycleList.forEach(h -> h.link().countInto(counters));
    }

    private void openGroup(String clientId, List<String> unitIds, long seqStart) {
        OutboundMessage will = options.grouping() == ConnectionGrouping.PER_UNIT
                ? ControlCentreLink.lastWill(topics, codec, unitIds.get(0), clientId, seqStart, clock.epochMillis()) : null;
        MessageBus bus = track(links.connect(clientId, will));
        List<ControlCentreLink> groupLinks = new ArrayList<>();
        for (String unitId : unitIds) {
            ControlCentreLink link = new ControlCentreLink(unitId, bus, topics, codec, clock, options.telemetryQos(),
                    options.commandQueueCapacity());
            UnitSettings s = UnitSettings.of(sim.grid().units().get(sim.grid().unitIndex(unitId)), options.interfaces());
            UnitPlantInterface ui = new UnitPlantInterface(s, new DirectTurbineField(sim, physicsEpoch, unitId), clock, link, journal,
                    seqStart);
            UnitDutyCycle cycle = new UnitDutyCycle(ui, link, codec);
            cycle.shareStatusDecoding(statusDecoding);
            cycles.put(unitId, cycle);
            groupLinks.add(link);
            bus.subscribe(topics.unitCommand(unitId), Qos.AT_LEAST_ONCE,
                    m -> link.offerCommand(m.payload(), clock.monotonicNanos()));
        }
        subscribeStatus(bus, groupLinks);
        bus.addConnectionListener(new ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
                groupLinks.forEach(ControlCentreLink::requestAnnounce);
            }

            @Override
            public void onDisconnected(Throwable cause) {
            }
        });
    }

    /** One status subscription per connection, fanned out to the links it serves. */
    static void subscribeStatus(MessageBus bus, List<ControlCentreLink> groupLinks) {
        // the filter is built from the kind, never by hand
        String filter = TopicTree.forSite(siteOf(groupLinks)).filterAll(TopicKind.CONTROLLER_STATUS);
        bus.subscribe(filter, Qos.AT_LEAST_ONCE, m -> {
            String topicId = TopicTree.parse(m.topic()).filter(t -> t.kind() == TopicKind.CONTROLLER_STATUS)
                    .map(t -> t.id("controller")).orElse(null);
            groupLinks.forEach(l -> l.offerStatus(topicId, m.payload(), m.retained()));
        });
    }

    private static String siteOf(List<ControlCentreLink> links) {
        return links.get(0).site();
    }

    private MessageBus track(MessageBus bus) {
        buses.add(bus);
        return bus;
    }

    private PlantAgent agentOrNull() {
        return agent;
    }

    /**
     * Journals the run into {@code j} (call before {@link #start()}): the agent's truth, meters, events
     * and lateness, every unit link's telemetry and acks, every plant-interface command fate and
     * decision, every fault order, plant-link up/down. The agent closes it when the loop stops.
     *
     * @param truthIntervalS scenario seconds between truth entries, &gt; 0
     */
    public PlantRunner journalTo(org.loopstand.plant.journal.PlantRunJournal j, double truthIntervalS) {
        this.runJournal = j;
        agent.journalTo(j, truthIntervalS);
        journal.attach(j);
        orders.journalTo(j, clock);
        for (UnitDutyCycle h : cycles.values()) {
            h.link().journalTo(j);
            h.unit().latency().listen((what, us) -> j.record("toReference".equals(what)
                    ? org.loopstand.plant.journal.PlantRunJournal.COMMAND_TO_REFERENCE_US
                    : org.loopstand.plant.journal.PlantRunJournal.COMMAND_TO_OUTPUT_US, us));
        }
        plantBus.addConnectionListener(new ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
                agent.noteEvent(Map.of("event", "linkUp", "clientId", plantBus.clientId(), "reconnect", reconnect));
            }

            @Override
            public void onDisconnected(Throwable cause) {
                agent.noteEvent(Map.of("event", "linkDown", "clientId", plantBus.clientId(), "cause", String.valueOf(cause)));
            }
        });
        return this;
    }

    /**
     * Before {@link #start}: the period of the field readings sent to units whose interface runs in another
     * process, ms of scenario time (default {@link FieldGateway#DEFAULT_PERIOD_MS}); no effect without such units.
     */
    public PlantRunner fieldPeriodMs(long periodMs) {
        if (field != null) {
            field.periodMs(periodMs);
        }
        return this;
    }

    /** Before {@link #start}: unit interface scan period, see {@link PlantAgent#setUnitScanMs}. */
    public PlantRunner unitScanMs(long unitScanMs) {
        agent.setUnitScanMs(unitScanMs);
        return this;
    }

    /**
     * Before {@link #start}: every command that comes off the bus to a unit of this process is told to
     * {@code watch} on the loop's thread, before any command fault stage (the pace keeper's
     * {@link PlantPacing#onCommandArrived}).
     */
    public PlantRunner watchCommandArrivals(UnitDutyCycle.CommandArrivals watch) {
        cycles.values().forEach(c -> c.watchCommandArrivals(watch));
        return this;
    }

    /**
     * Before {@link #start}: {@code marks} (the publisher thread, when it spreads each step's telemetry over
     * the step) is told when each physics step's unit pass begins and ends.
     */
    public PlantRunner markStepPasses(StepPassMarks marks) {
        agent.markStepPasses(marks);
        return this;
    }

    /** Starts the loop on its own thread (parks 1 ms when idle). */
    public PlantRunner start() {
        runner = new AgentRunner(agent, 1_000_000L).start();
        return this;
    }

    public PlantAgent agent() {
        return agent;
    }

    public UnitDutyCycle unitCycle(String unitId) {
        UnitDutyCycle h = cycles.get(unitId);
        if (h == null) {
            throw new IllegalArgumentException("unit '" + unitId + "' has no plant interface in this process");
        }
        return h;
    }

    public List<UnitDutyCycle> unitCycles() {
        return List.copyOf(cycles.values());
    }

    public MessageBus plantBus() {
        return plantBus;
    }

    public List<MessageBus> buses() {
        return List.copyOf(buses);
    }

    public PlantJournal journal() {
        return journal;
    }

    /** @return the counters behind the metrics page (messages, commands, refusals) */
    public PlantCounters counters() {
        return counters;
    }

    public StepLateness lateness() {
        return lateness;
    }

    public GridSimulator sim() {
        return sim;
    }

    public TopicTree topics() {
        return topics;
    }

    /** @return the thread's error if the loop stopped on one, else null */
    public Throwable failure() {
        return runner == null ? null : runner.failure();
    }

    /** Stops the loop (its journal gets its end entry), then closes every connection (cleanly: no last will). */
    @Override
    public void close() {
        if (runner != null) {
            runner.close();
        } else if (runJournal != null) {
            agent.onClose(); // never started: close the journal all the same
        }
        for (MessageBus b : buses) {
            try {
                b.close();
            } catch (RuntimeException e) {
                // closing the rest matters more
            }
        }
    }
}
