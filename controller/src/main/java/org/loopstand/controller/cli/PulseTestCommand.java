package org.loopstand.controller.cli;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.io.PrintStream;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.loopstand.controller.pulsetest.PulseTestEvaluator;
import org.loopstand.controller.pulsetest.PulseTestResult;
import org.loopstand.controller.pulsetest.PulseTestRunFolder;
import org.loopstand.controller.pulsetest.PulseTestRunner;
import org.loopstand.controller.pulsetest.analysis.Judgement;
import org.loopstand.controller.pulsetest.plan.PlanLimits;
import org.loopstand.controller.pulsetest.plan.TestPlan;
import org.loopstand.controller.pulsetest.plan.TestPlanLoader;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.controller.pulsetest.programme.SiteUnitReader;
import org.loopstand.controller.pulsetest.safety.KeyAbortSwitch;
import org.loopstand.controller.pulsetest.safety.SafetyGate;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.CommandTimeRules;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.PlantClockFollower;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code ./loopstand pulse-test}: the unit response test against a broker. */
@Command(name = "pulse-test", mixinStandardHelpOptions = true,
        description = "Send a pulse programme to one unit and judge its response (docs/pulse-test.md).")
public final class PulseTestCommand implements Callable<Integer> {
    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--unit", required = true, description = "unit id")
    String unit;
    @Option(names = "--site", required = true, description = "site file (declared unit data, site id)")
    Path site;
    @Option(names = "--broker", defaultValue = "tcp://127.0.0.1:1884", description = "MQTT broker URL (default ${DEFAULT-VALUE})")
    String broker;
    @Option(names = "--plan", defaultValue = "${env:LOOPSTAND_HOME:-.}/config/plans/standard.yaml", description = "test plan (default ${DEFAULT-VALUE})")
    Path planFile;
    @Option(names = {"--runs-dir", "--out"}, defaultValue = "runs", description = "folder for run folders (default ${DEFAULT-VALUE})")
    Path out;
    @Option(names = "--test-broker", description = "declare a non-loopback broker a test broker")
    boolean testBroker;
    @Option(names = "--live-plant", description = "allow a broker that is not a test broker (asks for a typed confirmation)")
    boolean livePlant;
    @Option(names = "--declared-from-telemetry", description = "judge against the unit's telemetry figures, not the site file's")
    boolean fromTelemetry;
    @Option(names = "--max-excursion-mw", description = "tighter excursion cap than the plan's, MW, in (0, plan cap]")
    Double maxExcursionMw;
    @Option(names = "--max-duration-s", description = "tighter duration cap than the plan's, s, in (0, plan cap]")
    Double maxDurationS;
    @Option(names = "--epoch", description = "controller epoch for the commands, epoch ms (default: now in epoch ms)")
    Long epoch;
    @Mixin
    AuthOptions auth;

    @Option(names = "--follow-plant-clock", description = "emulator at --rate N: take the plant's time base from its clock topic (test broker only)")
    boolean followPlantClock;

    /** How long a signal waits for the run folder to be written before the process ends, s. */
    static final long SHUTDOWN_WRITE_WAIT_S = 20;

    /** Console for the confirmation and the abort key; tests give their own. */
    Reader consoleIn = new InputStreamReader(System.in, StandardCharsets.UTF_8);

    @Override
    public Integer call() throws Exception {
        org.loopstand.protocol.cli.OldSpellings.of("--out", "--runs-dir")
                .warn(spec.commandLine().getParseResult().originalArgs(), System.err::println);
        PrintStream o = System.out;
        o.println("CAUTIONS");
        SafetyGate.CAUTIONS.forEach(c -> o.println("  - " + c));
        TestPlan plan;
        SiteUnitReader.SiteUnit siteUnit;
        try {
            plan = TestPlanLoader.load(planFile);
            siteUnit = SiteUnitReader.read(site, unit);
        } catch (ConfigFileException | IllegalArgumentException e) {
            System.err.println("pulse-test: " + e.getMessage());
            return 2;
        }
        PlanLimits caps;
        try {
            caps = SafetyGate.caps(plan.limits(), maxExcursionMw, maxDurationS);
        } catch (IllegalArgumentException e) {
            System.err.println("pulse-test: " + e.getMessage());
            return 2;
        }
        BufferedReader console = new BufferedReader(consoleIn);
        Optional<String> refusal = SafetyGate.admit(broker, testBroker, livePlant, unit, console, o);
        if (refusal.isPresent()) {
            System.err.println("pulse-test: " + refusal.get());
            return 3;
        }
        if (followPlantClock && !SafetyGate.isTestBroker(broker, testBroker)) {
            System.err.println("pulse-test: --follow-plant-clock is for an emulated plant on a test broker only");
            return 3;
        }
        Clock clock = WallClock.INSTANCE;
        if (epoch != null && !CommandTimeRules.epochWithinBound(epoch, clock.epochMillis())) {
            System.err.println("pulse-test: --epoch " + epoch + " is not an epoch in ms within [0, now + "
                    + CommandTimeRules.MAX_EPOCH_AHEAD_MS + " ms]; units would refuse it");
            return 2;
        }
        TopicTree topics = TopicTree.forSite(siteUnit.siteId());
        LinkSecurity security;
        MqttLinkConfig config;
        try {
            security = auth.resolve(broker, System.getenv());
            if (security.signsCommands() && security.keys().orElseThrow().signingKey(unit, clock.epochMillis()).isEmpty()) {
                throw new SecuritySetupException("the keys file has no key valid now for unit " + unit);
            }
            config = security.applyTo(MqttLinkConfig.builder().serverUri(broker).clientId("pulse-test-" + unit), null).build();
        } catch (SecuritySetupException | IllegalArgumentException e) {
            System.err.println("pulse-test: " + e.getMessage());
            return 2;
        }
        System.err.println(security.startMessage());
        PulseTestRunner runner;
        Written written;
        try (MqttLink link = new MqttLink(config, WallClock.INSTANCE).start()) {
            if (!link.awaitConnected(10_000)) {
                System.err.println("pulse-test: cannot connect to " + broker);
                return 4;
            }
            if (followPlantClock) {
                Optional<BusClock> plantClock = PlantClockFollower.follow(link, topics, WallClock.INSTANCE, 10_000);
                if (plantClock.isEmpty()) {
                    System.err.println("pulse-test: no tick on " + topics.clock() + " within 10 s (is the plant "
                            + "running with --rate other than 1?)");
                    return 4;
                }
                clock = plantClock.get();
            }
            runner = new PulseTestRunner(link, clock, topics, unit, plan, fromTelemetry ? null : siteUnit.unit(), caps,
                    epoch == null ? clock.epochMillis() : epoch, new KeyAbortSwitch(console), 30)
                    .removeGovernorAnswer(siteUnit.governor());
            Clock signingClock = clock; // the plant's time base when following it: key validity and signed times agree
            security.keys().ifPresent(keys -> runner.signCommandsWith(new CommandSigner(keys, signingClock, new MessageCodec())));
            o.printf(Locale.ROOT, "pulse-test: unit %s on %s, plan %s; caps %.1f MW, %.0f s. Type q and Enter to stop.%n",
                    unit, broker, plan.name(), caps.maxExcursionMw(), caps.maxDurationS());
            // A signal (Ctrl-C, SIGTERM) stops the programme and lets this thread write the run folder
            // before the process ends: the hook waits for it (bounded), since the JVM halts when hooks end.
            CountDownLatch folderWritten = new CountDownLatch(1);
            PulseTestRunner r = runner;
            Thread hook = new Thread(() -> {
                r.abortNow("stopped by a signal to the pulse-test process");
                try {
                    folderWritten.await(SHUTDOWN_WRITE_WAIT_S, TimeUnit.SECONDS);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }, "pulse-test-shutdown");
            Runtime.getRuntime().addShutdownHook(hook);
            try {
                try (AgentRunner agent = new AgentRunner(runner, 10_000_000L).start()) {
                    ProgressPrinter progress = new ProgressPrinter(o);
                    while (!runner.isDone() && agent.isRunning()) {
                        Thread.sleep(200); // CLI thread only waits and prints; the agent does the work
                        progress.show(runner.progress());
                    }
                }
                written = writeRunFolder(runner, plan, siteUnit);
            } finally {
                folderWritten.countDown();
                try {
                    Runtime.getRuntime().removeShutdownHook(hook);
                } catch (IllegalStateException shuttingDown) {
                    // the signal's hook is running: it returns as soon as the folder is written
                }
            }
        }
        PulseTestResult result = written.result();
        print(o, result);
        o.println("report: " + written.html());
        // a programme refused before anything was sent (caps, range, unit state) is a safety refusal
        return switch (result.verdict()) {
            case PASS -> 0;
            case REFUSED -> 3;
            default -> 1;
        };
    }

    private record Written(PulseTestResult result, Path html) {
    }

    /** Evaluates what the runner recorded (also a run cut short) and writes its run folder. */
    private Written writeRunFolder(PulseTestRunner runner, TestPlan plan, SiteUnitReader.SiteUnit siteUnit) {
        PulseTestResult result = PulseTestEvaluator.evaluate(runner.record(), plan);
        Path dir = out.resolve(PulseTestRunFolder.runId(result.record().startedMs(), unit));
        Map<String, String> cfg = new LinkedHashMap<>();
        cfg.put("broker", broker);
        cfg.put("site file", site.toString());
        cfg.put("plan file", planFile.toString());
        return new Written(result, PulseTestRunFolder.write(dir, result, plan, siteUnit.siteId(), cfg));
    }

    static void print(PrintStream o, PulseTestResult r) {
        o.printf(Locale.ROOT, "%-34s %-26s %-5s %-34s %s%n", "step", "figure", "", "measured (own output)", "limit");
        for (Judgement j : r.rows()) {
            o.printf(Locale.ROOT, "%-34s %-26s %-5s %-34s %s%n", j.step(), j.figure(), j.outcome(),
                    j.decidingFigure(), j.limit());
        }
        r.findings().forEach(f -> o.println("finding: unit " + f.text()));
        long notMeasured = r.rows().stream().filter(j -> !j.measured()).count();
        if (notMeasured > 0) {
            o.println(notMeasured + " row(s) not measured: they cannot pass and make no finding");
        }
        PulseTestRunFolder.whereLeft(r.record()).ifPresent(w -> o.println("unit: " + w));
        if (!r.record().stopReason().isEmpty()) {
            o.println(r.record().state().name().toLowerCase(Locale.ROOT) + ": " + r.record().stopReason());
        }
        o.println("verdict: " + r.verdict());
    }
}
