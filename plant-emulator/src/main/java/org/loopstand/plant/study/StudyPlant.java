package org.loopstand.plant.study;

import java.util.ArrayList;
import java.util.List;

import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The plant on the bus as a {@link RehearsalStudy} participant: a {@link PlantRunner} on an
 * {@link InMemoryBroker} (every connection made by the broker, so last wills and reconnects behave as
 * on MQTT), the scenario's fault stages wired in with {@link FaultHooks} (the study's engine, the run
 * record as observer), and a recorder connection that puts every published {@link ControllerStatus}
 * into the run record. The physics is stepped by the study's scenario engine; the plant agent follows
 * its steps and only runs its units, meters and faults after each step. A controller under test connects to the same broker.
 */
public final class StudyPlant implements Agent {
    private final PlantRunner plant;
    private final FaultHooks hooks;

    private StudyPlant(PlantRunner plant, FaultHooks hooks) {
        this.plant = plant;
        this.hooks = hooks;
    }

    /** Plant options a study uses by default: every unit in process, one connection per unit, 2 s scans. */
    public static PlantOptions defaultOptions(RehearsalStudy.Context c) {
        List<MeterSettings> meters = new ArrayList<>();
        c.grid().areas().forEach(a -> meters.add(MeterSettings.defaults(a.id())));
        return new PlantOptions(1.0, java.util.Set.of(), ConnectionGrouping.PER_UNIT, 1, meters, InterfaceOptions.defaults(),
                Qos.AT_MOST_ONCE, 256, c.scenario().scenario().seed(), 1e9);
    }

    /**
     * Builds the plant on {@code broker} (whose clock must be the study's).
     *
     * @param live true: also take fault orders from the faults topic
     */
    public static StudyPlant on(RehearsalStudy.Context c, InMemoryBroker broker, PlantOptions options, boolean live) {
        return on(c, broker, options, live, null, 1.0);
    }

    /**
     * As {@link #on(RehearsalStudy.Context, InMemoryBroker, PlantOptions, boolean)}, with the plant journaled
     * into {@code journal} as a real-time plant journals it (truth, publications through the fault stages,
     * command fates, events); the caller closes nothing: the plant closes the journal when it closes.
     *
     * @param journal the run folder's plant journal, may be null
     * @param truthIntervalS scenario seconds between truth entries, &gt; 0 (unused without a journal)
     */
    public static StudyPlant on(RehearsalStudy.Context c, InMemoryBroker broker, PlantOptions options, boolean live,
            org.loopstand.plant.journal.PlantRunJournal journal, double truthIntervalS) {
        PlantRunner plant = new PlantRunner(c.sim(), List.of(), options, broker::connect, c.clock(), w -> {
        });
        if (journal != null) {
            plant.journalTo(journal, truthIntervalS);
        }
        return wired(c, broker, options, live, plant, journal);
    }

    private static StudyPlant wired(RehearsalStudy.Context c, InMemoryBroker broker, PlantOptions options, boolean live,
            PlantRunner plant, org.loopstand.plant.journal.PlantRunJournal journal) {
        plant.agent().followSteps(c.engine());
        org.loopstand.plant.fault.FaultObserver observer = journal == null ? c.record()
                : org.loopstand.plant.fault.FaultObserver.all(List.of(c.record(), journal));
        FaultHooks hooks = FaultHooks.wire(plant, c.faults(), observer, c.record(), c.clock(), options.seed(), live);
        recordStatuses(broker, plant.topics(), c);
        return new StudyPlant(plant, hooks);
    }

    private static void recordStatuses(InMemoryBroker broker, TopicTree topics, RehearsalStudy.Context c) {
        InMemoryBus recorder = broker.connect(topics.site() + "-run-record");
        MessageCodec codec = new MessageCodec();
        RunRecord record = c.record();
        recorder.subscribe(topics.filterAll(TopicKind.CONTROLLER_STATUS), Qos.AT_LEAST_ONCE, m -> {
            if (codec.decode(m.payload(), ControllerStatus.class) instanceof Decoded.Ok<ControllerStatus> ok) {
                record.controllerStatus(c.clock().epochMillis(), ok.value());
            }
        });
    }

    public PlantRunner plant() {
        return plant;
    }

    public FaultHooks hooks() {
        return hooks;
    }

    @Override
    public int doWork() {
        return plant.agent().doWork();
    }

    @Override
    public void onClose() {
        plant.close();
    }

    @Override
    public String roleName() {
        return "study-plant";
    }
}
