package org.loopstand.plant.runtime;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.field.RemoteTurbineField;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.plant.unit.PlantJournal;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.plant.unit.UnitSettings;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.ClockSilenceWatch;
import org.loopstand.protocol.topic.TopicTree;

/**
 * A unit's plant interface as a process of its own: one connection with client id
 * {@code {site}-unit-{unit}} and last will "offline" on the unit's link topic. Killing the process is
 * a lost plant link: the controller sees the will and the physics keeps the last load reference.
 */
public final class UnitProcess implements AutoCloseable {
    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(UnitProcess.class);
    private final MessageBus bus;
    private final UnitProcessAgent agent;
    private final UnitPlantInterface unitInterface;
    private final ControlCentreLink link;
    private final OperatorOrders orders;
    private final Clock clock;
    private final PlantJournal journal = new PlantJournal();
    private AgentRunner runner;
    private volatile PlantRunJournal runJournal;

    public UnitProcess(String site, GeneratingUnit unit, InterfaceOptions options, Qos telemetryQos,
                       LinkFactory links, Clock clock) {
        TopicTree topics = TopicTree.forSite(site);
        MessageCodec codec = new MessageCodec();
        String clientId = clientId(site, unit.id());
        long seqStart = clock.epochMillis();
        this.bus = links.connect(clientId, ControlCentreLink.lastWill(topics, codec, unit.id(), clientId, seqStart, seqStart));
        RemoteTurbineField field = new RemoteTurbineField(unit.id(), bus, topics, codec, clock).start();
        this.link = new ControlCentreLink(unit.id(), bus, topics, codec, clock, telemetryQos, 256);
        UnitPlantInterface ui = new UnitPlantInterface(UnitSettings.of(unit, options), field, clock, link, journal, seqStart);
        this.unitInterface = ui;
        UnitDutyCycle cycle = new UnitDutyCycle(ui, link, codec);
        bus.subscribe(topics.unitCommand(unit.id()), Qos.AT_LEAST_ONCE, m -> link.offerCommand(m.payload(), clock.monotonicNanos()));
        PlantRunner.subscribeStatus(bus, List.of(link));
        bus.addConnectionListener(new org.loopstand.protocol.bus.ConnectionListener() {
            @Override
            public void onConnected(boolean reconnect) {
                link.requestAnnounce();
            }

            @Override
            public void onDisconnected(Throwable cause) {
            }
        });
        this.orders = new OperatorOrders(List.of(cycle), codec).subscribe(bus, topics);
        this.clock = clock;
        this.agent = new UnitProcessAgent(cycle, field, orders);
    }

    /** @return the client id a unit's own connection uses */
    public static String clientId(String site, String unitId) {
        return site + "-unit-" + unitId;
    }

    public UnitProcess start() {
        runner = new AgentRunner(agent, 1_000_000L).start();
        return this;
    }

    /**
     * Journals the unit's side from now on (call before {@link #start()}): every command's fate, each
     * decision (watchdog, mode, refusal codes, status refusals) with its reason, telemetry and acks sent,
     * command-to-reference latency; the caller closes the journal.
     */
    public UnitProcess journalTo(PlantRunJournal j) {
        runJournal = j;
        journal.attach(j);
        link.journalTo(j);
        orders.journalTo(j, clock);
        unitInterface.latency().listen((what, us) -> j.record("toReference".equals(what)
                ? PlantRunJournal.COMMAND_TO_REFERENCE_US : PlantRunJournal.COMMAND_TO_OUTPUT_US, us));
        return this;
    }

    /**
     * Runs on the plant's clock this unit follows ({@code --clock bus}, call before {@link #start()}): while
     * that time stands waiting for the next tick the controller's statuses wait and the watchdog is not
     * judged ({@link UnitDutyCycle#judgeTimeOnlyWhen}); each silence is journaled, {@code clockSilent} when
     * no tick came for the clock's silence limit, {@code clockHeard} when one came again.
     */
    public UnitProcess followPlantClock(BusClock plantClock) {
        agent.dutyCycle().judgeTimeOnlyWhen(() -> !plantClock.standing());
        String unitId = unitInterface.unitId();
        agent.watchClockSilence(new ClockSilenceWatch(plantClock, e -> {
            Map<String, Object> entry = new LinkedHashMap<>(e);
            entry.put("unit", unitId);
            LOG.warn("unit {}: {}", unitId, entry);
            PlantRunJournal j = runJournal;
            if (j != null) {
                j.event(clock.epochMillis(), entry);
            }
        }));
        return this;
    }

    /** @return the unit's plant interface (e.g. to set its command verifier before {@link #start()}) */
    public UnitPlantInterface unitInterface() {
        return unitInterface;
    }

    public UnitProcessAgent agent() {
        return agent;
    }

    public MessageBus bus() {
        return bus;
    }

    public PlantJournal journal() {
        return journal;
    }

    @Override
    public void close() {
        if (runner != null) {
            runner.close();
        }
        bus.close();
    }
}
