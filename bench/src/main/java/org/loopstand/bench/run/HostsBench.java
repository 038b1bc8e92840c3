package org.loopstand.bench.run;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.LockSupport;
import java.util.function.Consumer;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.brokernode.hosts.NamespaceHosts;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * The bench across hosts (layout hosts): four network-namespace hosts on this machine. Host A: broker node n1
 * and the plant (every unit's turbine, served over the field topics); host B: node n2 and the first unit host;
 * host C: node n3 and the second unit host (the units' plant interfaces, split by index); host D: the
 * controller alone, as in a control centre. The three nodes are the shipped cluster configuration; each
 * process connects first to its own host's node (the controller to n3) with the others as fail-over. This JVM
 * orders the window, reads every process's CPU time from /proc over it, and puts the parts' figures together
 * ({@link HostsResult}).
 */
public final class HostsBench {
    /** Hosts A..D; the first three carry a broker node each. */
    static final int HOSTS = 4;
    /** first letters of the bench's namespaces ({@link NamespaceHosts#forThisProcess}) */
    static final String FAMILY = "lb";
    static final int MQTT_PORT = 1883;
    static final int CLUSTER_PORT = 61616;
    /**
     * Heap of each node: 1 GB carried 1,000 units; at 10,000 units (5,000 per unit host) nodes n2 and n3 ran out of a
     * 1 GB heap within two minutes of the units' start (OutOfMemoryError: every unit's retained link state is a queue
     * of its own on the node where it was published, "$sys.mqtt.retain.…/link", besides the messages in flight).
     */
    static String nodeHeap(int units) {
        return units > 2_000 ? "-Xmx3g" : "-Xmx1g";
    }
    /** How long the nodes may take, once listening, to connect their cluster bridges to each other, s. */
    static final long CLUSTER_FORM_S = 120;
    /** How long a part may take to connect and have its subscriptions acknowledged, s (see {@link BenchLinks}). */
    static final long PART_READY_S = 1_200;
    /**
     * How long a part may take from its stop order to its figures written, s. When the controller stops, its
     * offline status makes every unit leave remote and journal it: 1,500 units per host took more than 60 s
     * at load 28 (3,000 units), and the unit host writes its figures only after that.
     */
    static final long PART_DONE_S = 300;

    /** Thrown when the hosts cannot be made (not root, no iproute2): the run cannot happen on this machine. */
    public static final class NamespacesUnavailable extends IllegalStateException {
        NamespacesUnavailable(String message, Throwable cause) {
            super(message, cause);
        }
    }

    private final BenchSettings s;
    private final Path nodeConfig;
    private final Consumer<String> say;
    private final List<String> partMain;
    private final Clock clock = WallClock.INSTANCE;

    /**
     * @param settings   layout hosts, with a broker user (every node asks for a login off loopback)
     * @param nodeConfig the Artemis node file with placeholders (config/broker/artemis/broker-node.xml)
     * @param partMain   the main class and sub-command that run one part ({@link BusPart})
     */
    public HostsBench(BenchSettings settings, Path nodeConfig, Consumer<String> say, List<String> partMain) {
        if (settings.layout() != BenchSettings.Layout.HOSTS || settings.brokerUser().isEmpty()) {
            throw new IllegalArgumentException("the hosts bench needs layout hosts and a broker user");
        }
        if (settings.units() < 2) {
            throw new IllegalArgumentException("the hosts bench needs at least 2 units (one per unit host), got "
                    + settings.units());
        }
        this.s = settings;
        this.nodeConfig = nodeConfig;
        this.say = say;
        this.partMain = List.copyOf(partMain);
    }

    public HostsResult run() throws Exception {
        Files.createDirectories(s.outDir());
        if (!Files.isReadable(nodeConfig)) {
            throw new IllegalArgumentException("broker node file " + nodeConfig + " does not exist or is not readable");
        }
        double loadBefore = ProcStat.loadAverage1Min();
        String siteId = "bench-" + s.units();
        SiteGenerator.write(s.outDir().resolve("site.yaml"), siteId, s.units(), s.areas(), s.cycleS(),
                s.unitTelemetryMaxAgeMs() > BenchSettings.CONTROLLER_TELEMETRY_AGE_MS ? s.unitTelemetryMaxAgeMs() : 0);
        Path settingsFile = s.outDir().resolve("bench-settings.properties");
        SettingsFile.write(s, settingsFile);
        Path users = writeLogins();
        NamespaceHosts hosts;
        try {
            NamespaceHosts.sweepOrphans(FAMILY).forEach(ns -> say.accept("bench: removed hosts left by a gone bench: " + ns));
            hosts = NamespaceHosts.forThisProcess(FAMILY, 'a', HOSTS);
        } catch (IllegalStateException e) {
            throw new NamespacesUnavailable("cannot create network namespaces (needs root and iproute2): "
                    + e.getMessage(), e);
        }
        say.accept("bench: hosts A..D made");
        List<Process> nodes = new ArrayList<>();
        List<PartProcess> parts = new ArrayList<>();
        // Ctrl-C or a kill (not -9) of the bench must not leave broker nodes, parts and namespaces running
        Thread hook = new Thread(() -> stopAll(parts, nodes, hosts), "hosts-bench-cleanup");
        Runtime.getRuntime().addShutdownHook(hook);
        try {
            for (int i = 1; i <= 3; i++) {
                nodes.add(startNode(hosts, i, users));
            }
            for (int i = 1; i <= 3; i++) {
                awaitLine(s.outDir().resolve("node-n" + i + ".log"), "broker node n" + i + " listening", nodes.get(i - 1));
            }
            say.accept("bench: three broker nodes up on hosts A, B, C (" + hosts.address(1) + ".." + hosts.address(3) + ")");
            double formedS = NodeFigures.awaitCluster(nodes, s.outDir(), CLUSTER_FORM_S, clock);
            say.accept(String.format(Locale.ROOT, "bench: cluster formed (every node's bridges to both peers connected)"
                    + " %.1f s after the last node listened", formedS));
            // one after the other: each subscribes what it needs, which the nodes set up one queue at a time
            Map<String, Double> readyS = new LinkedHashMap<>();
            long started = clock.monotonicNanos();
            PartProcess ctl = part(parts, hosts, 4, "controller", "controller", uris(hosts, 3, 1, 2), settingsFile, siteId);
            say.accept("bench: " + ctl.awaitReady(PART_READY_S) + readyAfter(readyS, "controller", started));
            started = clock.monotonicNanos();
            PartProcess plant = part(parts, hosts, 1, "plant", "plant", uris(hosts, 1, 2, 3), settingsFile, siteId);
            say.accept("bench: " + plant.awaitReady(PART_READY_S) + readyAfter(readyS, "plant", started));
            started = clock.monotonicNanos();
            List<PartProcess> unitHosts = List.of(
                    part(parts, hosts, 2, "units-0", "units", uris(hosts, 2, 3, 1), settingsFile, siteId, "--unit-share", "0/2"),
                    part(parts, hosts, 3, "units-1", "units", uris(hosts, 3, 1, 2), settingsFile, siteId, "--unit-share", "1/2"));
            for (int i = 0; i < unitHosts.size(); i++) {
                say.accept("bench: " + unitHosts.get(i).awaitReady(PART_READY_S) + readyAfter(readyS, "units-" + i, started));
            }
            Map<String, Long> pids = new LinkedHashMap<>();
            for (int i = 1; i <= 3; i++) {
                pids.put("broker n" + i, nodes.get(i - 1).pid());
            }
            pids.put("plant", plant.pid());
            pids.put("units-0", unitHosts.get(0).pid());
            pids.put("units-1", unitHosts.get(1).pid());
            pids.put("controller", ctl.pid());
            say.accept("bench: layout hosts, " + s.units() + " units, " + s.areas() + " areas; warm-up " + s.warmupS() + " s");
            LockSupport.parkNanos(Math.round(s.warmupS() * 1e9));
            parts.forEach(p -> p.order("mark"));
            long t0 = clock.monotonicNanos();
            Map<String, Long> ticksAtMark = ticks(pids);
            // the nodes' readings right after the parts' orders (ms apart when the nodes answer at once); a node that
            // does not answer is reported, its threads dumped, and the run goes on without that reading
            List<String> silent = new ArrayList<>(NodeFigures.order(nodes, s.outDir(), "start", clock));
            watch(pids, t0);
            double windowS = (clock.monotonicNanos() - t0) / 1e9;
            Map<String, Long> ticksAtEnd = ticks(pids);
            Map<String, Long> resident = new LinkedHashMap<>();
            pids.forEach((name, pid) -> resident.put(name, ProcStat.residentBytes(pid)));
            plant.order("end");
            unitHosts.forEach(u -> u.order("end"));
            ctl.order("stop");
            silent.addAll(NodeFigures.order(nodes, s.outDir(), "end", clock));
            ctl.awaitDone(PART_DONE_S);
            for (PartProcess u : unitHosts) {
                u.order("stop");
                u.awaitDone(PART_DONE_S);
            }
            plant.order("stop");
            plant.awaitDone(PART_DONE_S);
            say.accept("bench: every part wrote its figures");
            silent.addAll(NodeFigures.order(nodes, s.outDir(), "final", clock));
            if (!silent.isEmpty()) {
                say.accept("bench: broker nodes that wrote no counters when ordered (threads in node-*-threads-*.txt): " + silent);
            }
            List<NodeFigures> nodeFigures = new ArrayList<>();
            for (int i = 1; i <= 3; i++) {
                nodeFigures.add(NodeFigures.read(s.outDir(), "n" + i));
            }
            Map<String, Double> cpuPct = new LinkedHashMap<>();
            pids.keySet().forEach(name -> cpuPct.put(name, ticksAtEnd.get(name) < 0 || ticksAtMark.get(name) < 0 ? Double.NaN
                    : 100.0 * (ticksAtEnd.get(name) - ticksAtMark.get(name)) / ProcStat.CLOCK_TICKS_PER_S / windowS));
            return HostsResult.of(s, windowS, cpuPct, resident, readyS, loadBefore, ProcStat.loadAverage1Min(),
                    PartFigures.read(s.outDir(), "plant"), PartFigures.read(s.outDir(), "controller"),
                    List.of(PartFigures.read(s.outDir(), "units-0"), PartFigures.read(s.outDir(), "units-1")), nodeFigures,
                    commandsExpiredTowardsTheirUnit(siteId, nodeFigures));
        } finally {
            stopAll(parts, nodes, hosts);
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // the hook runs or ran: stopAll is idempotent
            }
        }
    }

    /** Stops the parts, then the nodes, then removes the hosts; a second call (the hook after finally) does nothing. */
    private static void stopAll(List<PartProcess> parts, List<Process> nodes, NamespaceHosts hosts) {
        synchronized (parts) {
            for (PartProcess p : parts) {
                p.close();
            }
            parts.clear();
            for (Process n : nodes) {
                n.destroy();
            }
            for (Process n : nodes) {
                try {
                    if (!n.waitFor(20, TimeUnit.SECONDS)) {
                        n.destroyForcibly().waitFor(10, TimeUnit.SECONDS);
                    }
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    n.destroyForcibly();
                }
            }
            nodes.clear();
            hosts.close();
        }
    }

    /**
     * @return commands the nodes expired on the way to their unit's own host over the whole run (units-0 connects
     *         first to n2, units-1 to n3)
     */
    private long commandsExpiredTowardsTheirUnit(String siteId, List<NodeFigures> nodes) throws IOException {
        Grid grid = SiteLoader.load(s.outDir().resolve("site.yaml"));
        Map<String, Integer> hostOfUnit = new java.util.HashMap<>();
        for (int h = 0; h < 2; h++) {
            for (GeneratingUnit u : UnitHost.share(grid, h, 2)) {
                hostOfUnit.put(u.id(), h);
            }
        }
        return NodeFigures.commandsExpiredTowardsTheirUnit(nodes, hostOfUnit,
                List.of(UnitHost.clientIdPrefix(siteId, 0), UnitHost.clientIdPrefix(siteId, 1)),
                List.of(nodes.get(1).nodeId(), nodes.get(2).nodeId()));
    }

    /** Notes how long a part took from its start to ready (JVM start, connect, every SUBACK); @return it, said */
    private String readyAfter(Map<String, Double> readyS, String name, long startedNanos) {
        double secs = (clock.monotonicNanos() - startedNanos) / 1e9;
        readyS.put(name, secs);
        return String.format(Locale.ROOT, " (ready %.1f s after its start)", secs);
    }

    /** Users file of the nodes (the one bench login), the cluster password and the bench's password file. */
    private Path writeLogins() throws IOException {
        byte[] b = new byte[16];
        SecureRandom random = new SecureRandom();
        random.nextBytes(b);
        String password = HexFormat.of().formatHex(b);
        random.nextBytes(b);
        Files.writeString(s.outDir().resolve("cluster.password"), HexFormat.of().formatHex(b) + "\n");
        Files.writeString(s.outDir().resolve(BenchSettings.BROKER_PASSWORD_FILE), password + "\n");
        return Files.writeString(s.outDir().resolve("users.properties"), s.brokerUser() + " = " + password + "\n");
    }

    private Process startNode(NamespaceHosts hosts, int i, Path users) throws IOException {
        List<String> cmd = hosts.java(i, List.of(nodeHeap(s.units())), "org.loopstand.brokernode.cli.BrokerNodeCli");
        cmd.addAll(List.of("--name", "n" + i, "--host", hosts.address(i), "--mqtt-port", "" + MQTT_PORT, "--cluster-port",
                "" + CLUSTER_PORT, "--config", nodeConfig.toString(), "--users", users.toString(), "--cluster-password-file",
                s.outDir().resolve("cluster.password").toString(), "--work-dir", s.outDir().resolve("n" + i).toString(),
                "--counters-dir", s.outDir().toString()));
        for (int j = 1; j <= 3; j++) {
            if (j != i) {
                cmd.addAll(List.of("--peer", hosts.address(j) + ":" + CLUSTER_PORT));
            }
        }
        return new ProcessBuilder(cmd).redirectErrorStream(true)
                .redirectOutput(s.outDir().resolve("node-n" + i + ".log").toFile()).start();
    }

    private PartProcess part(List<PartProcess> parts, NamespaceHosts hosts, int host, String name, String role, String uris,
                             Path settingsFile, String siteId, String... more) throws IOException {
        PartProcess p = PartProcess.start(hosts.exec(host), name, role, partMain, s, settingsFile, siteId, uris, List.of(more));
        parts.add(p);
        return p;
    }

    /** @return the broker list of a process: the nodes on the given hosts, in order */
    private static String uris(NamespaceHosts hosts, int... order) {
        List<String> u = new ArrayList<>();
        for (int i : order) {
            u.add("tcp://" + hosts.address(i) + ":" + MQTT_PORT);
        }
        return String.join(",", u);
    }

    /** Waits out the window, saying each process's CPU every sample period. */
    private void watch(Map<String, Long> pids, long t0) {
        long end = t0 + Math.round(s.durationS() * 1e9);
        long period = Math.round(s.sampleS() * 1e9);
        Map<String, Long> last = ticks(pids);
        long lastNanos = t0;
        for (long next = t0 + period; clock.monotonicNanos() < end; ) {
            LockSupport.parkNanos(Math.max(1, Math.min(end, next) - clock.monotonicNanos()));
            long now = clock.monotonicNanos();
            if (now >= next) {
                Map<String, Long> t = ticks(pids);
                StringBuilder line = new StringBuilder(String.format(Locale.ROOT, "bench: t=%.0f s CPU %%:", (now - t0) / 1e9));
                for (String name : pids.keySet()) {
                    line.append(String.format(Locale.ROOT, " %s %.0f", name,
                            100.0 * (t.get(name) - last.get(name)) / ProcStat.CLOCK_TICKS_PER_S / ((now - lastNanos) / 1e9)));
                }
                say.accept(line.toString());
                last = t;
                lastNanos = now;
                next += period;
            }
        }
    }

    private static Map<String, Long> ticks(Map<String, Long> pids) {
        Map<String, Long> t = new LinkedHashMap<>();
        pids.forEach((name, pid) -> t.put(name, ProcStat.cpuTicks(pid)));
        return t;
    }

    private static void awaitLine(Path log, String line, Process p) throws IOException {
        for (int waitedMs = 0; waitedMs < 90_000; waitedMs += 200) {
            if (Files.exists(log) && Files.readString(log, StandardCharsets.UTF_8).contains(line)) {
                return;
            }
            if (!p.isAlive()) {
                throw new IllegalStateException("broker node ended before it listened; see " + log);
            }
            LockSupport.parkNanos(200_000_000L);
        }
        throw new IllegalStateException("'" + line + "' not seen in " + log + " within 90 s");
    }
}
