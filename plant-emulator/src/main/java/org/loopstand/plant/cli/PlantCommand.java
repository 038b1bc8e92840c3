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
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.Scenario;
import org.loopstand.plant.scenario.ScenarioEvent;
import org.loopstand.plant.scenario.RunScenario;
import org.loopstand.plant.scenario.RunScenarioLoader;
import org.loopstand.plant.fault.CommandOutcomeListener;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLog;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.site.ConfigFileException;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.runtime.UnitHost;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.SystemTime;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code loopstand plant}: the physics, area meters and unit plant interfaces on MQTT, until Ctrl-C. */
@Command(name = "plant", mixinStandardHelpOptions = true,
        description = "Run the grid physics in real time (or accelerated) and put meters and units on MQTT.")
public final class PlantCommand implements Callable<Integer> {
    @Option(names = "--site", required = true, description = "site file (YAML)")
    Path site;

    @Option(names = "--scenario", description = "scenario file (YAML): seed, step, events, faults (see docs/faults.md)")
    Path scenarioFile;

    @Option(names = "--broker", description = "broker URL, e.g. tcp://127.0.0.1:1883; default: start the embedded broker on 127.0.0.1:1884")
    String broker;

    @Option(names = "--broker-port", defaultValue = "1884", description = "port of the embedded broker on 127.0.0.1, 0 = any free port (default ${DEFAULT-VALUE}); not used with --broker")
    int brokerPort;

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

    @Option(names = "--duration", description = "stop after this many wall seconds (default: run until Ctrl-C)")
    Double durationS;

    @Mixin
    InterfaceMixin iface;

    @Mixin
    AuthOptions auth;

    @Override
    public Integer call() throws Exception {
        Grid grid;
        Scenario scenario = null;
        RunScenario rehearsal = null;
        try {
            grid = SiteLoader.load(site);
            if (scenarioFile != null) {
                rehearsal = RunScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid);
                scenario = rehearsal.scenario();
            }
        } catch (ConfigFileException e) {
            System.err.println("refused:");
            System.err.println(e.getMessage());
            return 2;
        }
        PlantOptions options;
        try {
            options = options(grid);
        } catch (IllegalArgumentException e) {
            System.err.println("refused: " + e.getMessage());
            return 2;
        }
        double stepS = scenario == null || Double.isNaN(scenario.stepS()) ? new StepSizeRule(grid).defaultStepS() : scenario.stepS();
        GridSimulator sim = scenario == null ? new GridSimulator(grid)
                : new GridSimulator(grid, stepS, scenario.seed(), scenario.startHourOfDay());
        List<ScenarioEvent> events = scenario == null ? List.of() : scenario.events();

        LinkSecurity security;
        EmbeddedBroker embedded = null;
        try {
            security = auth.resolve(broker != null ? broker : "tcp://" + EmbeddedBroker.DEFAULT_BIND_ADDRESS + ":"
                    + brokerPort, System.getenv());
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
                embedded.start(Duration.ofSeconds(30));
            } catch (IllegalStateException e) {
                System.err.println("plant: embedded broker did not start: " + e.getMessage());
                return 1;
            }
            uri = embedded.serverUri();
        }
        Clock clock = rate == 1.0 ? WallClock.INSTANCE : new AcceleratedClock(WallClock.INSTANCE, rate, SystemTime.wallEpochMillis());
        PlantRunner runner = new PlantRunner(sim, events, options, MqttLinks.to(uri, WallClock.INSTANCE, security, grid.siteId()),
                clock, PlantCommand::say);
        PlantSecurity.requireSignedCommands(security, runner.hosts().stream().map(UnitHost::unit).toList(), clock);
        FaultEngine faults = new FaultEngine(clock, clock.epochMillis(), new FaultLog());
        if (rehearsal != null) {
            for (var f : rehearsal.faults()) {
                faults.schedule(f).ifPresent(why -> say("plant: fault " + f.id() + " not scheduled: " + why));
            }
        }
        FaultHooks.wire(runner, faults, new FaultLog(), CommandOutcomeListener.NONE, clock,
                scenario == null ? 0 : scenario.seed(), true);
        int here = runner.hosts().size();
        say(String.format(Locale.ROOT, "plant: site %s, broker %s%s, rate %s, %d unit interface(s) here (%s), %d elsewhere",
                grid.siteId(), uri, embedded != null ? " (embedded)" : "", trim(rate), here,
                options.grouping().cliName(), options.remoteUnits().size()));
        CountDownLatch stopped = new CountDownLatch(1);
        EmbeddedBroker brokerToClose = embedded;
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            runner.close();
            if (brokerToClose != null) {
                brokerToClose.close();
            }
            stopped.countDown();
        }, "plant-shutdown"));
        runner.start();
        if (durationS != null) {
            if (!stopped.await(Math.round(durationS * 1000), TimeUnit.MILLISECONDS)) {
                say("plant: " + trim(durationS) + " s done; lateness p99 " + runner.lateness().histogramUs().getValueAtPercentile(99) + " µs");
                System.exit(0);
            }
        } else {
            stopped.await();
        }
        return 0;
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
