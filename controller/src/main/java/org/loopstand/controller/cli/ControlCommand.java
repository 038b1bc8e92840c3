package org.loopstand.controller.cli;

import org.loopstand.controller.runtime.OfflineStatus;
import org.loopstand.protocol.security.AuthPolicy;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.locks.LockSupport;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.pulsetest.safety.SafetyGate;
import org.loopstand.protocol.time.BusClock;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalWriter;
import org.loopstand.protocol.metrics.MetricsEndpoint;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.security.AuthOptions;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.SecuritySetupException;
import org.loopstand.protocol.security.StatusSeal;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code ./loopstand control}: the secondary controller as a process on the bus. */
@Command(name = "control", mixinStandardHelpOptions = true,
        description = "Run the secondary controller (AGC) against a broker.")
public final class ControlCommand implements Callable<Integer> {
    static final String CAUTION = "CAUTION: this sends raise/lower commands to generating units; never point it at a"
            + " live plant or a production broker without the plant's and the grid operator's procedures.";

    @Option(names = "--site", required = true, description = "site file (YAML), e.g. config/sites/demo-site.yaml")
    Path site;

    @Option(names = "--broker", defaultValue = "tcp://127.0.0.1:1884", description = "MQTT broker URL (default ${DEFAULT-VALUE})")
    String broker;

    @Option(names = "--clock", defaultValue = "wall", description = "wall, or bus: follow the plant's scenario clock")
    String clockMode;

    @Option(names = "--controller-id", defaultValue = "controller-1", description = "controller id (default ${DEFAULT-VALUE})")
    String controllerId;

    @Option(names = "--journal", description = "directory for controller.jsonl and controller.hlog (none if absent)")
    Path journalDir;

    @Option(names = "--duration-s", defaultValue = "0", description = "stop after this many scenario seconds; 0 = run until stopped")
    double durationS;

    @Option(names = "--live-plant", description = "allow a broker that is not on the loopback interface")
    boolean livePlant;

    @Option(names = "--metrics-port", paramLabel = "PORT", description = "serve /metrics (Prometheus text) on"
            + " 127.0.0.1:PORT, 0 = any free port; printed as 'metrics: URL' (default: none)")
    Integer metricsPort;

    @Mixin
    AuthOptions auth;

    /** Console for the live-plant confirmation; tests give their own. */
    java.io.Reader consoleIn = new java.io.InputStreamReader(System.in, java.nio.charset.StandardCharsets.UTF_8);

    @Override
    public Integer call() throws Exception {
        System.out.println(CAUTION);
        if (!"wall".equals(clockMode) && !"bus".equals(clockMode)) {
            System.err.println("control: --clock must be wall or bus, got '" + clockMode + "'");
            return 2;
        }
        // a comma-separated list of cluster nodes is loopback only when every node is
        boolean loopback = AuthPolicy.isLoopbackBroker(broker);
        if (!loopback && !livePlant) {
            System.err.println("control: refusing broker " + broker + " (not loopback); add --live-plant only under the"
                    + " plant's procedures");
            return 2;
        }
        ControllerSiteConfig config;
        try {
            config = ControllerSiteReader.read(site);
        } catch (ConfigFileException e) {
            System.err.println("control: the site file cannot be used:\n" + e.getMessage());
            return 2;
        }
        if (!loopback) {
            // the same typed confirmation as pulse-test: the site id, since every unit of it may move
            java.util.Optional<String> refusal = SafetyGate.admit(broker, false, true, config.siteId(),
                    "The controller will send raise/lower commands to every unit of site " + config.siteId() + ".",
                    "site", new java.io.BufferedReader(consoleIn), System.out);
            if (refusal.isPresent()) {
                System.err.println("control: " + refusal.get());
                return 3;
            }
        }
        LinkSecurity security;
        try {
            security = auth.resolve(broker, System.getenv());
        } catch (SecuritySetupException e) {
            System.err.println("control: " + e.getMessage());
            return 2;
        }
        System.err.println(security.startMessage());
        Clock wall = WallClock.INSTANCE;
        BusClock busClock = "bus".equals(clockMode) ? new BusClock(wall) : null;
        Clock clock = busClock != null ? busClock : wall;
        long epoch = wall.epochMillis(); // epoch ms, see CommandTimeRules
        StatusSeal seal = security.keys().map(k -> new StatusSeal(k, new MessageCodec())).orElse(null);
        if (seal != null && !seal.hasKeyFor(controllerId)) {
            System.err.println("control: the keys file has no status key for " + controllerId + " (a line "
                    + controllerId + ".<keyId> = <base64>); statuses go out unsigned");
            seal = null;
        }
        OutboundMessage will = OfflineStatus.will(config.siteId(), controllerId, epoch, epoch, seal);
        MessageBus bus;
        try {
            bus = BusConnector.connect(broker, controllerId, will, security);
        } catch (IllegalArgumentException e) {
            System.err.println("control: " + e.getMessage());
            return 2;
        }
        JournalWriter journal = null;
        HistogramLogs hlog = null;
        if (journalDir != null) {
            journal = JournalWriter.create(journalDir.resolve("controller.jsonl"), "controller", epoch,
                    Map.of("site", config.siteId(), "controllerId", controllerId, "broker", broker,
                            "cycleMs", config.settings().cycleMs()), wall, JournalWriter.DEFAULT_FLUSH_INTERVAL);
            hlog = HistogramLogs.create(journalDir.resolve("controller.hlog"), wall, 60_000_000L, 3, 10_000);
        }
        ControllerAgent agent = new ControllerAgent(config, bus, clock, busClock, controllerId, epoch, journal, hlog);
        security.keys().ifPresent(keys -> agent.signCommandsWith(new CommandSigner(keys, clock, new MessageCodec())));
        if (seal != null) {
            agent.signStatusWith(seal);
        }
        AgentRunner runner = new AgentRunner(agent, 1_000_000L);
        agent.wakeOnInput(runner::wake);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            runner.close();
            bus.close();
        }));
        MetricsEndpoint metrics = null;
        if (metricsPort != null) {
            try {
                metrics = new MetricsEndpoint(agent.metrics()).start("127.0.0.1", metricsPort);
            } catch (java.io.IOException | IllegalArgumentException e) {
                System.err.println("control: --metrics-port " + metricsPort + ": cannot listen: " + e.getMessage());
                bus.close();
                return 2;
            }
            System.out.println("metrics: http://127.0.0.1:" + metrics.port() + "/metrics");
        }
        runner.start();
        System.out.println("control: " + controllerId + " on " + broker + ", site " + config.siteId() + ", cycle "
                + config.settings().cycleMs() + " ms, clock " + clockMode);
        long startNanos = wall.monotonicNanos();
        while (runner.isRunning()) {
            LockSupport.parkNanos(200_000_000L);
            if (durationS > 0 && (wall.monotonicNanos() - startNanos) / 1e9 * Math.max(1.0, rateOf(busClock)) >= durationS) {
                break;
            }
        }
        runner.close();
        bus.close();
        if (metrics != null) {
            metrics.close();
        }
        if (runner.failure() != null) {
            System.err.println("control: stopped on an error: " + runner.failure());
            return 1;
        }
        System.out.println("control: stopped after " + agent.cyclesRun() + " cycles, " + agent.commandsSent()
                + " commands, rejected " + agent.intake().rejectedByReason());
        return 0;
    }

    private static double rateOf(BusClock c) {
        return c == null ? 1.0 : c.rate();
    }
}
