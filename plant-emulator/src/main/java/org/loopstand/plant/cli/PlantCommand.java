package org.loopstand.plant.cli;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;

import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.journal.PlantRunJournal;
import org.loopstand.plant.live.LiveView;

import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.runtime.RunAnnouncer;
import org.loopstand.protocol.message.RunPhase;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.check.RunRecord;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code loopstand plant}: the physics, area meters and unit plant interfaces on MQTT, until Ctrl-C. */
@Command(name = "plant", mixinStandardHelpOptions = true,
        description = "Run the grid physics in real time (or accelerated) and put meters and units on MQTT.")
public final class PlantCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--site", required = true, description = "site file (YAML)")
    Path site;

    @Option(names = "--scenario", description = "scenario file (YAML): seed, step, events, faults (see docs/faults.md)")
    Path scenarioFile;

    @Option(names = "--broker", description = "broker URL, e.g. tcp://127.0.0.1:1883; default: start the embedded broker on 127.0.0.1:1884")
    String broker;

    @Option(names = "--broker-port", defaultValue = "1884", description = "port of the embedded broker on 127.0.0.1, 0 = any free port (default ${DEFAULT-VALUE}); not used with --broker")
    int brokerPort;

    @Option(names = "--quiet-loads", description = "switch the loads' random noise off: a quiet test bed for `pulse-test` (docs/pulse-test.md)")
    boolean quietLoads;
    @Option(names = "--rate", defaultValue = "1", description = "scenario seconds per wall second (default ${DEFAULT-VALUE})")
    double rate;

    @Option(names = "--units", split = ",", paramLabel = "ID", description = "run only these units' plant interfaces here; the others run as `loopstand unit`")
    List<String> units;

    @Option(names = "--no-units", description = "run no plant interface here (all as `loopstand unit`)")
    boolean noUnits;

    @Option(names = "--grouping", defaultValue = "per-unit", description = "per-unit, per-plant or pooled (default ${DEFAULT-VALUE})")
    String grouping;

    @Option(names = "--pool-size", defaultValue = "4", description = "connections for --grouping pooled (default ${DEFAULT-VALUE})")
    int poolSize;

    @Option(names = "--meter-scan-ms", defaultValue = "2000", description = "area meter scan period, ms (default ${DEFAULT-VALUE})")
    long meterScanMs;

    @Option(names = "--meter-scan", paramLabel = "AREA=MS", description = "scan period of one area's meter, ms (repeatable)")
    Map<String, Long> meterScanByArea = new LinkedHashMap<>();

    @Option(names = "--seed", defaultValue = "1", description = "meter noise seed (default ${DEFAULT-VALUE})")
    long seed;

    @Option(names = "--late-warn-s", defaultValue = "1", description = "step lateness that is reported, s (default ${DEFAULT-VALUE})")
    double lateWarnS;

    @Option(names = {"--wall-duration-s", "--duration"}, description = "stop after this many wall seconds (default: the scenario's durationS, or until Ctrl-C without a scenario)")
    Double durationS;

    @Option(names = "--journal", paramLabel = "DIR", description = "run folder for plant.jsonl and plant.hlog (none if absent)")
    Path journalDir;

    @Option(names = "--truth-interval-s", defaultValue = "1", description = "scenario seconds between physics truth entries in the journal (default ${DEFAULT-VALUE})")
    double truthIntervalS;

    @Option(names = "--linger-s", defaultValue = "0", description = "after the scenario ends, keep the embedded broker up this many wall seconds (or until stopped) so the controller can stop cleanly")
    double lingerS;

    @Option(names = "--hosts", paramLabel = "FILE", description = "hosts file for network faults (YAML, docs/faults.md); needs root")
    Path hostsFile;

    @Option(names = "--wire-profile", paramLabel = "FILE", description = "speak another topic and payload layout to the"
            + " controller (YAML; docs/controller-contract.md, \"Wire profiles\"); the journal keeps the rig's own form")
    Path wireProfile;

    @Mixin
    LiveMixin live;

    @Mixin
    ScenarioClockMixin start;

    @Mixin
    LoopThreadMixin loop;

    @Mixin
    InterfaceMixin iface;

    @Mixin
    AuthOptions auth;

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.cli.OldSpellings.of("--duration", "--wall-duration-s")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        PlantInputs inputs;
        try {
            inputs = PlantInputs.read(site, scenarioFile, hostsFile, wireProfile, quietLoads, System.err::println);
        } catch (ConfigFileException e) {
            System.err.println("plant: refused:");
            System.err.println(e.getMessage());
            return 2;
        }
        Grid grid = inputs.grid();
        Scenario scenario = inputs.scenario();
        RunScenario rehearsal = inputs.rehearsal();
        HostLinks hostLinks = inputs.hostLinks();
        org.loopstand.plant.profile.WireProfile profile = inputs.profile();
        PlantOptions options;
        try {
            options = options(grid);
        } catch (IllegalArgumentException e) {
            System.err.println("plant: refused: " + e.getMessage());
            return 2;
        }
        double stepS = scenario == null || Double.isNaN(scenario.stepS()) ? new StepSizeRule(grid).defaultStepS() : scenario.stepS();
        GridSimulator sim = scenario == null ? new GridSimulator(grid)
                : new GridSimulator(grid, stepS, scenario.seed(), scenario.startHourOfDay(),
                        scenario.integrator());
        List<ScenarioEvent> events = scenario == null ? List.of() : scenario.events();

        LinkSecurity security;
        EmbeddedBroker embedded = null;
        try {
            // port 0 (any free port) is not a valid URI port; the policy judges the host only
            security = auth.resolve(broker != null ? broker : "tcp://" + EmbeddedBroker.DEFAULT_BIND_ADDRESS + ":"
                    + Math.max(1, brokerPort), System.getenv());
            PlantSecurity.checkGrouping(security, options.grouping());
            if (broker == null) {
                embedded = new EmbeddedBroker(EmbeddedBroker.DEFAULT_BIND_ADDRESS, brokerPort);
                var brokerAuth = PlantSecurity.embeddedAuth(security, grid, options.interfaces().acceptedControllers());
                if (brokerAuth != null) {
                    embedded.withAuth(brokerAuth);
                }
            }
        } catch (SecuritySetupException e) {
            System.err.println("plant: " + e.getMessage());
            return 2;
        }
        System.err.println(security.startMessage());
        String uri = broker;
        if (uri == null) {
            try {
                // a busy 2-core machine has taken over 30 s to start it; the rehearsal waits 90 s for the ready line
                embedded.start(Duration.ofSeconds(75));
            } catch (IllegalStateException e) {
                System.err.println("plant: embedded broker did not start: " + e.getMessage());
                return 1;
            }
            uri = embedded.serverUri();
        }
        Clock clock = start.clock(rate);
        var links = MqttLinks.to(uri, WallClock.INSTANCE, security, grid.siteId());
        if (profile != null) {
            links = org.loopstand.plant.profile.ProfiledLinks.of(links, profile,
                    (topic, why) -> System.err.println("plant: wire profile: " + topic + ": " + why));
            say("plant: wire profile " + profile.name() + " from " + wireProfile + " on the controller's side of the bus");
        }
        PlantRunner runner = new PlantRunner(sim, events, options, loop.links(links::connect), clock, PlantCommand::say);
        runner.markStepPasses(loop.stepMarks());
        start.pace(clock, runner, iface.watchdogS);
        PlantSecurity.requireSignedCommands(security, runner.unitCycles().stream().map(UnitDutyCycle::unit).toList(), clock);
        PlantRunJournal runJournal = null;
        if (journalDir != null) {
            if (!(truthIntervalS > 0)) {
                System.err.println("plant: refused: --truth-interval-s must be positive, got " + truthIntervalS);
                runner.close();
                closeQuietly(embedded);
                return 2;
            }
            Map<String, Object> header = PlantJournalHeader.of(grid, site, scenarioFile, scenario, events, rate, seed,
                    uri, embedded != null, options, sim, meterScanMs);
            header.put("security", security.insecure() ? "insecure" : "secured"); // the report marks insecure runs
            header.put("acceptedControllers", new java.util.TreeSet<>(options.interfaces().acceptedControllers()));
            runJournal = PlantRunJournal.create(journalDir, runner.agent().epochMsAt(0), header, clock, WallClock.INSTANCE, loop.journalQueue);
            runner.journalTo(runJournal, truthIntervalS);
        }
        RunRecord record = new RunRecord(runner.agent().epochMsAt(0));
        FaultHooks hooks = ScenarioFaults.wire(runner, rehearsal, record, runJournal, clock, scenario == null ? 0 : scenario.seed(), hostLinks);
        LiveView liveView;
        try {
            liveView = live.startIfAsked(runner, hooks, clock, embedded != null,
                    rehearsal == null ? List.of() : rehearsal.checks().stream().map(c -> c.name()).toList(),
                    journalDir == null ? null : journalDir.resolve("report.html"));
        } catch (IllegalArgumentException | java.io.IOException e) {
            System.err.println("plant: refused: live view: " + e.getMessage());
            runner.close();
            closeQuietly(embedded);
            return 2;
        }
        if (liveView != null) {
            say("live view: " + liveView.address());
        }
        if (rehearsal != null) {
            runner.agent().checkWith(record, rehearsal.checks(), line -> {
                say(line);
                if (liveView != null) {
                    liveView.checkDecided(line);
                }
            });
        }
        ControllerStatusTap.subscribe(runner, clock, runJournal, rehearsal != null ? record : null);
        if (scenario != null) {
            runner.agent().endAt(scenario.durationS());
        }
        CountDownLatch stopped = new CountDownLatch(1);
        EmbeddedBroker brokerToClose = embedded;
        AtomicBoolean closed = new AtomicBoolean();
        Runnable closeAll = () -> {
            if (closed.compareAndSet(false, true)) {
                runner.close();
                if (liveView != null) {
                    liveView.close();
                }
                closeQuietly(brokerToClose);
            }
        };
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            closeAll.run();
            stopped.countDown();
        }, "plant-shutdown"));
        runner.start();
        RunAnnouncer run = new RunAnnouncer(runner.plantBus(), runner.topics(), new org.loopstand.protocol.codec.MessageCodec(),
                clock, RunAnnouncer.newRunId(WallClock.INSTANCE.epochMillis(), ProcessHandle.current().pid()),
                scenario == null ? Double.NaN : scenario.durationS(), rate);
        if (org.loopstand.plant.runtime.PublisherThread.unwrap(runner.plantBus()) instanceof org.loopstand.protocol.bus.mqtt.MqttLink l && !l.awaitConnected(30_000)) {
            System.err.println("plant: not connected to " + uri + " after 30 s; going on, the link keeps retrying");
        }
        RunAnnouncer.publishSiteSchedules(grid, runner.agent().plant());
        run.announce(start.waitGo ? RunPhase.WAITING : RunPhase.RUNNING, 0, null);
        int here = runner.unitCycles().size();
        say(String.format(Locale.ROOT, "plant: site %s, broker %s%s, rate %s, %d unit interface(s) here (%s), %d elsewhere%s",
                grid.siteId(), uri, embedded != null ? " (embedded)" : "", trim(rate), here,
                options.grouping().cliName(), options.remoteUnits().size(),
                scenario == null ? "" : ", scenario " + trim(scenario.durationS()) + " s"));
        if (start.waitGo) {
            if (!start.awaitGo(clock, () -> new GridSimulator(sim.grid(), sim.stepS(), 1, 0), PlantCommand::say)) {
                say("plant: stdin closed before 'go'; stopping");
                closeAll.run();
                return 1;
            }
            run.announce(RunPhase.RUNNING, 0, null);
            say("plant: go, scenario time runs");
        }
        long startNanos = WallClock.INSTANCE.monotonicNanos();
        String why = null;
        while (why == null) {
            if (stopped.await(200, TimeUnit.MILLISECONDS)) {
                return 0; // stopped from outside; the hook closed everything
            }
            if (runner.failure() != null) {
                System.err.println("plant: the physics loop stopped on an error: " + runner.failure());
                closeAll.run();
                return 1;
            }
            double wallS = (WallClock.INSTANCE.monotonicNanos() - startNanos) / 1e9;
            if (runner.agent().finished()) {
                why = "scenario done";
            } else if (durationS != null && wallS >= durationS) {
                why = trim(durationS) + " s wall done";
            }
        }
        run.announce(RunPhase.ENDED, Math.round(runner.sim().timeS() * 1000),
                runner.agent().finished() ? "completed" : "stopped");
        start.end(runner.sim().timeS(), PlantCommand::say);
        runner.close(); // stops the loop: the journal gets its end entry
        say(String.format(Locale.ROOT, "plant: %s at %.1f s simulated; step lateness p99 %d µs, max %d µs%s", why,
                runner.sim().timeS(), runner.lateness().histogramUs().getValueAtPercentile(99),
                runner.lateness().histogramUs().getMaxValue(),
                (journalDir == null ? "" : "; journal " + journalDir.resolve("plant.jsonl")) + loop.summary()));
        if (security.insecure()) {
            say("plant: INSECURE run (no broker auth, commands unsigned): commands taken per controller "
                    + record.acceptedByController() + "; any id besides the rehearsed controller's is a third party");
        }
        if (embedded != null && lingerS > 0) {
            stopped.await(Math.round(lingerS * 1000), TimeUnit.MILLISECONDS);
        }
        closeAll.run();
        return 0;
    }

    private static void closeQuietly(EmbeddedBroker b) {
        if (b != null) {
            try {
                b.close();
            } catch (RuntimeException e) {
                System.err.println("plant: embedded broker did not stop cleanly: " + e.getMessage());
            }
        }
    }

    PlantOptions options(Grid grid) {
        Set<String> remote = new LinkedHashSet<>();
        if (noUnits && units != null) {
            throw new IllegalArgumentException("--units and --no-units exclude each other");
        }
        if (units != null) {
            for (String u : units) {
                if (!grid.hasUnit(u)) {
                    throw new IllegalArgumentException("--units: unit '" + u + "' is not in site " + grid.siteId());
                }
            }
        }
        for (GeneratingUnit u : grid.units()) {
            if (noUnits || (units != null && !units.contains(u.id()))) {
                remote.add(u.id());
            }
        }
        for (String area : meterScanByArea.keySet()) {
            if (!grid.hasArea(area)) {
                throw new IllegalArgumentException("--meter-scan: area '" + area + "' is not in site " + grid.siteId());
            }
        }
        List<MeterSettings> meters = new ArrayList<>();
        for (Area a : grid.areas()) {
            meters.add(MeterSettings.defaults(a.id()).withScanPeriodMs(meterScanByArea.getOrDefault(a.id(), meterScanMs)));
        }
        ConnectionGrouping g;
        try {
            g = ConnectionGrouping.parse(grouping);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("--grouping must be per-unit, per-plant or pooled, got " + grouping);
        }
        if (!(rate > 0) || rate > AcceleratedClock.MAX_RATE) {
            throw new IllegalArgumentException("--rate must be in (0, " + AcceleratedClock.MAX_RATE + "], got " + rate);
        }
        start.check();
        loop.check();
        return new PlantOptions(rate, remote, g, poolSize, meters, iface.options(), iface.qos(), 256, seed, lateWarnS);
    }

    static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }

    static void say(String line) {
        System.out.println(line);
        System.out.flush();
    }
}
