package org.loopstand.app.rehearsal;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;

import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code loopstand rehearse [SCENARIO]}: plant and controller as separate processes, progress, a run
 * folder with both journals and the report.
 */
@Command(name = "rehearse", mixinStandardHelpOptions = true,
        description = {"Run a full rehearsal: the plant (with the embedded broker) and the controller under test (the"
                + " built-in one, a command of yours, or one you start yourself) as separate processes, progress on the"
                + " terminal, journals, verdict and report in runs/<timestamp>-<scenario>/.",
                "Exit code: 0 when the run completed and its verdict is PASS (or the scenario has no checks), 1 on a FAIL"
                        + " or CUT SHORT verdict or when a process failed, 2 on bad options, 130 when stopped by Ctrl-C.",
                "CAUTION: the controller sends raise/lower commands; rehearse only against the emulator or a test broker."})
public final class RehearsalCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    static final String DEFAULT_SCENARIO = "config/scenarios/rehearse-unit-trip.yaml";
    /** Wall time a rehearsal aims at when the scenario names no rateX, s. */
    static final double TARGET_WALL_S = 120;

    @Parameters(arity = "0..1", paramLabel = "SCENARIO", description = "scenario file (default " + DEFAULT_SCENARIO + ")")
    Path scenario;

    @Option(names = "--broker", description = "use this running MQTT 5 broker (e.g. tcp://127.0.0.1:1883) instead of the embedded one")
    String broker;

    @Option(names = "--rate", description = "scenario seconds per wall second (default: the scenario's rateX,"
            + " else its duration / 120 s, at least 1)")
    Double rate;

    @Option(names = "--runs-dir", defaultValue = "runs", description = "where run folders go (default ${DEFAULT-VALUE})")
    Path runsDir;

    @Option(names = {"--broker-port", "--port"}, defaultValue = "1884", description = "port of the embedded broker (default ${DEFAULT-VALUE})")
    int port;

    @Option(names = "--site", description = "site file (default: config/sites/<the scenario's site>.yaml)")
    Path site;

    @Option(names = "--live-port", paramLabel = "PORT", defaultValue = "0", description = "the plant serves the live view"
            + " (charts, fault controls, /metrics) on 127.0.0.1:PORT, 0 = any free port (default); its address is printed")
    int livePort;

    @Option(names = "--no-live-view", description = "no live view (no port opened)")
    boolean noLiveView;

    @Option(names = "--controller-command", paramLabel = "CMD", description = "rehearse this controller: a command line the"
            + " rig starts through the shell in the folder you run rehearse from, with LOOPSTAND_BROKER_URL, LOOPSTAND_SITE_ID,"
            + " LOOPSTAND_SITE_FILE, LOOPSTAND_TOPIC_ROOT, LOOPSTAND_CONTROLLER_ID, LOOPSTAND_RATE and LOOPSTAND_RUN_DIR set"
            + " (docs/controller-contract.md); its output goes to controller.log in the run folder")
    String controllerCommand;

    @Option(names = "--external-controller", paramLabel = "ID", description = "rehearse a controller that you start yourself"
            + " under this id: the rig starts the plant, prints what to connect to and waits for its first status")
    String externalController;

    @Option(names = "--controller-id", paramLabel = "ID", description = "with --controller-command: the id the plant accepts"
            + " commands from (default " + ControllerUnderTest.DEFAULT_ID + ")")
    String controllerId;

    @Option(names = "--wire-profile", paramLabel = "FILE", description = "the plant speaks this topic and payload layout to"
            + " the controller (YAML; docs/controller-contract.md, \"Wire profiles\"); LOOPSTAND_WIRE_PROFILE tells the controller")
    Path wireProfile;

    @Option(names = "--pace-lag-s", paramLabel = "S", description = "the plant holds and slows the scenario clock when its"
            + " physics falls more than S scenario seconds behind, 0 = never (default: the plant's, 1 s; docs/plant.md, \"Pacing\")")
    Double paceLagS;

    @Option(names = "--pace-command-share", paramLabel = "F", description = "the plant slows the scenario clock when a"
            + " command arrives with more than this share of its validity gone, 0 = never (default: the plant's, 0.25;"
            + " docs/plant.md, \"Pacing\")")
    Double paceCommandShare;

    @Option(names = "--controller-wait-s", paramLabel = "S", description = "how long to wait for the controller's first"
            + " status, wall s (default 90; 300 for --external-controller)")
    Double controllerWaitS;

    /** @return the options handed on to the plant process */
    private List<String> plantArgs() {
        List<String> a = new java.util.ArrayList<>();
        if (!noLiveView) {
            a.addAll(List.of("--live-port", Integer.toString(livePort)));
        }
        if (paceLagS != null) {
            a.addAll(List.of("--pace-lag-s", Double.toString(paceLagS))); // the plant checks the value
        }
        if (paceCommandShare != null) {
            a.addAll(List.of("--pace-command-share", Double.toString(paceCommandShare)));
        }
        return a;
    }

    /** @return the controller the options name; refuses contradicting options */
    ControllerUnderTest controller() {
        if (controllerCommand != null && externalController != null) {
            throw new IllegalArgumentException("give either --controller-command or --external-controller, not both");
        }
        if (controllerId != null && controllerCommand == null) {
            throw new IllegalArgumentException("--controller-id goes with --controller-command"
                    + " (an external controller's id is the value of --external-controller)");
        }
        if (externalController != null) {
            return ControllerUnderTest.external(externalController);
        }
        if (controllerCommand != null) {
            return ControllerUnderTest.command(controllerId != null ? controllerId : ControllerUnderTest.DEFAULT_ID, controllerCommand);
        }
        return ControllerUnderTest.builtInController();
    }

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.cli.OldSpellings.of("--port", "--broker-port")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        org.loopstand.protocol.config.InstallFolder install = org.loopstand.protocol.config.InstallFolder.fromEnvironment();
        Path scenarioFile = scenario != null ? scenario : install.shipped(DEFAULT_SCENARIO);
        if (!Files.isRegularFile(scenarioFile)) {
            System.err.println("rehearse: scenario file " + scenarioFile + " does not exist");
            return 2;
        }
        org.loopstand.protocol.config.OldKeys.SCENARIO.warn(scenarioFile, System.err::println);
        Path siteFile = site;
        if (siteFile == null) {
            String id = Rehearsal.scenarioSiteId(scenarioFile);
            if (id == null) {
                System.err.println("rehearse: scenario " + scenarioFile + " names no site (top-level 'siteId:'); give --site FILE");
                return 2;
            }
            try {
                siteFile = install.siteFor(scenarioFile, id);
            } catch (IllegalArgumentException e) {
                System.err.println("rehearse: " + e.getMessage());
                return 2;
            }
        }
        double r;
        if (rate != null) {
            r = rate;
        } else if (Rehearsal.topValue(scenarioFile, "rateX") != null) {
            r = Double.parseDouble(Rehearsal.topValue(scenarioFile, "rateX"));
        } else {
            String d = Rehearsal.topValue(scenarioFile, "durationS");
            r = d == null ? 1 : Math.max(1, Math.ceil(Double.parseDouble(d) / TARGET_WALL_S));
        }
        RehearsalSettings settings;
        try {
            ControllerUnderTest controller = controller();
            double waitS = controllerWaitS != null ? controllerWaitS : controller.external() ? 300 : 90;
            if (!(waitS > 0) || waitS > 86_400) {
                throw new IllegalArgumentException("--controller-wait-s must be in (0, 86400] s, got " + controllerWaitS);
            }
            settings = new RehearsalSettings(scenarioFile, siteFile, broker, r, runsDir,
                    Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                    System.getenv("LOOPSTAND_PLANT_CP"), System.getenv("LOOPSTAND_CONTROLLER_CP"),
                    port, 90_000, plantArgs(), Path.of("").toAbsolutePath(), controller,
                    Math.round(waitS * 1000), wireProfile);
            if (wireProfile != null) {
                // refused here, before anything starts, with every problem at its line
                org.loopstand.plant.profile.WireProfileLoader.load(wireProfile, Rehearsal.topValue(siteFile, "siteId"));
            }
        } catch (IllegalArgumentException e) {
            System.err.println("rehearse: " + e.getMessage());
            return 2;
        } catch (org.loopstand.protocol.config.ConfigFileException e) {
            System.err.println("rehearse: the wire profile is refused:");
            System.err.println(e.getMessage());
            return 2;
        }
        // the progress line owns the terminal: the rehearsal's own bus link speaks only when something is wrong
        if (org.slf4j.LoggerFactory.getLogger("org.loopstand.protocol.bus") instanceof ch.qos.logback.classic.Logger l) {
            l.setLevel(ch.qos.logback.classic.Level.WARN);
        }
        Rehearsal rehearsal = new Rehearsal(settings, WallClock.INSTANCE, System.out, System.console() != null);
        Thread hook = new Thread(() -> {
            rehearsal.abort();
            try {
                rehearsal.awaitDone(120_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }, "rehearsal-stop");
        Runtime.getRuntime().addShutdownHook(hook);
        Rehearsal.Outcome o = rehearsal.run();
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException e) {
            // shutting down already (Ctrl-C): the hook is waiting for us and ends now
        }
        return o.exitCode();
    }
}
