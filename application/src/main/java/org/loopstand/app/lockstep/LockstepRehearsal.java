package org.loopstand.app.lockstep;

import org.loopstand.controller.runtime.OfflineStatus;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.plant.check.CheckOutcome;
import org.loopstand.plant.cli.ControllerStatusTap;
import org.loopstand.plant.cli.PlantCli;
import org.loopstand.plant.cli.PlantJournalHeader;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.study.RehearsalStudy;
import org.loopstand.plant.study.StudyPlant;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.report.html.HtmlReportWriter;
import org.loopstand.report.model.ReportModel;
import org.loopstand.report.run.RunFolder;
import org.loopstand.report.run.RunReportBuilder;

/**
 * One closed-loop run in lockstep: the plant on an in-memory broker and the built-in controller
 * ({@link ControllerAgent} with the site file's controller settings) step on the {@link RehearsalStudy}'s
 * virtual clock, the same wiring as the lockstep closed-loop tests. The run folder gets what a
 * real-time rehearsal writes there: {@code plant.jsonl} and {@code plant.hlog} (through
 * {@link PlantRunJournal}, fed as the plant process feeds it), {@code controller.jsonl} and
 * {@code controller.hlog}, and {@code report.html} from the report module's {@link RunReportBuilder}.
 *
 * <p>Every journal time and every flush is on the virtual clock, so the same scenario and random
 * seed give the same journals byte for byte (docs/lockstep.md).
 */
public final class LockstepRehearsal {
    /** The controller's id on the in-memory bus: the id the plant's unit interfaces accept commands from. */
    public static final String CONTROLLER_ID = "controller-1";
    /** Scenario seconds between truth entries in plant.jsonl, as the plant's --truth-interval-s default. */
    static final double TRUTH_INTERVAL_S = 1.0;
    /** Journal header value of "broker": there is none, the bus is in memory. */
    static final String BUS = "in-memory (lockstep)";

    /** What came out: the checks as the study decided them, and the report model (null when it could not be made). */
    public record Outcome(List<CheckOutcome> checks, ReportModel report, List<String> notes) {
    }

    private final Path siteFile;
    private final Path scenarioFile;
    private final Long seedOverride;
    private java.util.function.Consumer<String> warnings = w -> { };

    /**
     * @param siteFile     the site (YAML), also read for the controller's settings
     * @param scenarioFile the scenario, the same file {@code rehearse} takes
     * @param seedOverride random seed replacing the scenario's, null to keep it
     */
    public LockstepRehearsal(Path siteFile, Path scenarioFile, Long seedOverride) {
        this.siteFile = siteFile;
        this.scenarioFile = scenarioFile;
        this.seedOverride = seedOverride;
    }

    /** @param sink receives the site's and the start's warnings as {@code file: warning: what}; none by default */
    public LockstepRehearsal warningsTo(java.util.function.Consumer<String> sink) {
        this.warnings = java.util.Objects.requireNonNull(sink, "sink");
        return this;
    }

    /**
     * Runs the scenario to its end into {@code run} (an existing, empty folder) and writes the report.
     *
     * @throws IOException              when the site file cannot be read
     * @throws IllegalArgumentException on a refused site, scenario or fault (the message names it)
     */
    public Outcome run(Path run) throws IOException {
        Grid grid = SiteLoader.loadForRun(siteFile, warnings);
        RunScenario rs = scenario(grid);
        RunScenarioLoader.startWarnings(scenarioFile, rs, grid).forEach(warnings);
        Scenario scenario = rs.scenario();
        ControllerSiteConfig controllerSite = ControllerSiteReader.read(siteFile);
        JournalForwarder plantFaults = new JournalForwarder();
        RehearsalStudy.Result result = new RehearsalStudy(grid, rs, 1.0, c -> {
            InMemoryBroker broker = new InMemoryBroker(c.clock(), DeliveryMode.DIRECT);
            PlantOptions options = StudyPlant.defaultOptions(c);
            Map<String, Object> header = PlantJournalHeader.of(grid, siteFile, scenarioFile, scenario, scenario.events(),
                    1.0, scenario.seed(), BUS, false, options, c.sim(), options.meters().get(0).scanPeriodMs());
            header.put("security", "in-memory bus, no broker");
            header.put("acceptedControllers", new java.util.TreeSet<>(options.interfaces().acceptedControllers()));
            PlantRunJournal plantJournal = PlantRunJournal.create(run, RehearsalStudy.START_EPOCH_MS, header, c.clock(), c.clock());
            plantFaults.to(plantJournal);
            StudyPlant plant = StudyPlant.on(c, broker, options, false, plantJournal, TRUTH_INTERVAL_S);
            // the checks go into plant.jsonl as the plant process journals them, decided when the plant closes
            plant.plant().agent().checkWith(c.record(), rs.checks(), line -> { });
            ControllerStatusTap.subscribe(plant.plant(), c.clock(), plantJournal, null);
            long now = c.clock().epochMillis();
            Map<String, Object> controllerHeader = new LinkedHashMap<>(); // filled in order: the same bytes every run
            controllerHeader.put("site", grid.siteId());
            controllerHeader.put("controllerId", CONTROLLER_ID);
            controllerHeader.put("broker", BUS);
            controllerHeader.put("cycleMs", controllerSite.settings().cycleMs());
            JournalWriter controllerJournal = JournalWriter.create(run.resolve("controller.jsonl"), "controller", now,
                    controllerHeader, c.clock(), JournalWriter.DEFAULT_FLUSH_INTERVAL);
            HistogramLogs controllerHistograms = HistogramLogs.create(run.resolve("controller.hlog"), c.clock(), 60_000_000L, 3, 10_000);
            InMemoryBus link = broker.connect(CONTROLLER_ID, OfflineStatus.will(grid.siteId(), CONTROLLER_ID, now, now));
            ControllerAgent controller = new ControllerAgent(controllerSite, link, c.clock(), null, CONTROLLER_ID, now,
                    controllerJournal, controllerHistograms);
            List<Agent> agents = new ArrayList<>();
            agents.add(plant);
            agents.add(controller);
            return agents;
        }, plantFaults).run();
        List<String> notes = new ArrayList<>();
        notes.add("Run in lockstep: plant, built-in controller and an in-memory bus on one virtual clock (no broker,"
                + " no network); wall-time figures in this report are not those of a real-time rehearsal.");
        ReportModel model = report(run, scenario, notes);
        return new Outcome(result.outcomes(), model, notes);
    }

    /**
     * Runs the scenario to its end with the same plant, controller and bus but no journals, run folder or
     * report: the checks alone, for campaigns of many runs. Everything it builds is its own, so runs on
     * several threads of one JVM share no mutable state.
     *
     * @return the checks as the study decided them, in the scenario's order
     * @throws IOException              when the site file cannot be read
     * @throws IllegalArgumentException on a refused site, scenario or fault (the message names it)
     */
    public List<CheckOutcome> checksOnly() throws IOException {
        Grid grid = SiteLoader.loadForRun(siteFile, w -> { });
        RunScenario rs = scenario(grid);
        ControllerSiteConfig controllerSite = ControllerSiteReader.read(siteFile);
        return new RehearsalStudy(grid, rs, 1.0, c -> {
            InMemoryBroker broker = new InMemoryBroker(c.clock(), DeliveryMode.DIRECT);
            StudyPlant plant = StudyPlant.on(c, broker, StudyPlant.defaultOptions(c), false);
            long now = c.clock().epochMillis();
            InMemoryBus link = broker.connect(CONTROLLER_ID, OfflineStatus.will(grid.siteId(), CONTROLLER_ID, now, now));
            ControllerAgent controller = new ControllerAgent(controllerSite, link, c.clock(), null, CONTROLLER_ID, now, null, null);
            return List.<Agent>of(plant, controller);
        }, org.loopstand.plant.fault.FaultObserver.NONE).run().outcomes();
    }

    private RunScenario scenario(Grid grid) throws IOException {
        RunScenario loaded = RunScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid);
        Scenario scenario = seedOverride == null ? loaded.scenario() : loaded.scenario().withSeed(seedOverride);
        return new RunScenario(scenario, loaded.rateX(), loaded.faults(), loaded.checks());
    }

    private ReportModel report(Path run, Scenario scenario, List<String> notes) {
        Map<String, String> config = new LinkedHashMap<>();
        config.put("scenario file", scenarioFile.toString());
        config.put("site file", siteFile.toString());
        config.put("mode", "lockstep, virtual clock");
        config.put("random seed", Long.toString(scenario.seed()));
        config.put("broker", BUS);
        config.put("controller under test", "built-in controller (" + CONTROLLER_ID + ", in this process)");
        ReportModel model = RunReportBuilder.build(RunFolder.read(run), config, notes, PlantCli.VERSION);
        HtmlReportWriter.write(model, run.resolve("report.html"));
        return model;
    }
}
