package org.loopstand.brokernode;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.brokernode.hosts.NamespaceHosts;
import org.loopstand.protocol.time.WallClock;

/**
 * The rig's MQTT traffic across three hosts on a three-node Artemis cluster: one network namespace per
 * host (veth pairs to a bridge), one broker node per host, a command sender on host 3 (the controller's
 * host) and a command receiver on host 2 (a unit host). Checks, in one run bounded to about a minute:
 * a command crosses nodes; a killed node's clients fail over to the next node and receive again; a
 * partition of host 3 stops the flow, and it comes back when the link heals; no command arrives after
 * its validUntil. Figures go to stdout and target/cluster-figures.txt (docs/performance.md).
 *
 * <p>Needs root and iproute2: without them it fails under CI=true and is skipped otherwise.
 */
class ThreeNodeClusterTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");
    private static final String TOPIC = "loopstand/v1/cluster-demo/unit/u7/command";
    private static final int MQTT_PORT = 1883;
    private static final int CLUSTER_PORT = 61616;
    private static final long PERIOD_MS = 100;
    private static final long VALIDITY_MS = 2000;
    private static final long STEADY_MS = 2500;
    private final WallClock clock = WallClock.INSTANCE;
    private TestProcesses children;
    private final Map<String, Long> figures = new LinkedHashMap<>();
    private NamespaceHosts hosts;

    @TempDir
    Path dir;

    @AfterEach
    void tearDown() throws InterruptedException, IOException {
        children.killAll();
        if (hosts != null) {
            hosts.close();
        }
        children.keepOutput("cluster-run");
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS) // the whole run, failures included, stays inside CI's budget
    void shouldCarryCommandsAcrossNodesAndSurviveANodeKillAndAPartition() throws Exception {
        long t0 = clock.epochMillis();
        children = new TestProcesses(dir);
        hosts = NetnsHosts.createOrSkip(3);
        Path users = Files.writeString(dir.resolve("users.properties"), "rig-probe = probe-password-0123456789\n");
        Path clusterPassword = Files.writeString(dir.resolve("cluster-password"), "cluster-password-0123456789\n");
        Process[] nodes = new Process[4];
        for (int i = 1; i <= 3; i++) {
            nodes[i] = startNode(i, users, clusterPassword);
        }
        for (int i = 1; i <= 3; i++) {
            String started = "broker node n" + i + " listening";
            awaitLine(dir.resolve("n" + i + ".out"), l -> l.startsWith(started), 40_000,
                    "node n" + i + " did not start; see " + dir.resolve("n" + i + ".err"));
        }
        figures.put("nodesStartedMs", clock.epochMillis() - t0);

        Path sub = start(2, "sub", "unit-host-2", list(2, 3, 1));
        Path pub = start(3, "pub", "controller-host-3", list(3, 1, 2));
        long firstCross = awaitLine(sub, l -> l.startsWith("recv "), 30_000,
                "no command crossed from node n3 to node n2 within 30 s");
        figures.put("firstCrossNodeCommandMs", firstCross - t0);
        assertSteadyFlow(pub, sub, "across nodes n3 to n2");

        // kill node n2, the unit host's node: its client goes on to n3, the next in its list
        long lastSeqBeforeKill = lastRecvSeq(sub);
        long killedAt = clock.epochMillis();
        long[] cpuBeforeKill = {0, cpuTicks(nodes[1]), cpuTicks(nodes[2]), cpuTicks(nodes[3])};
        nodes[2].destroyForcibly().waitFor(10, TimeUnit.SECONDS);
        long reconnected = awaitLine(sub, l -> l.startsWith("conn ") && epochOf(l) > killedAt, 20_000,
                "the unit host's client did not reconnect within 20 s of killing its node");
        assertThat(lastConnUri(sub)).isEqualTo("tcp://" + hosts.address(3) + ":" + MQTT_PORT);
        long resumed = awaitLine(sub, l -> l.startsWith("recv ") && seqOf(l) > lastSeqBeforeKill
                && epochOf(l, 3) > killedAt, 20_000, "no command arrived after the failover");
        figures.put("nodeKillReconnectMs", reconnected - killedAt);
        figures.put("nodeKillFirstCommandMs", resumed - killedAt);
        assertSteadyFlow(pub, sub, "after the failover to n3");

        // partition: host 3 (controller and node n3) cut off from hosts 1 and 2
        long cutAt = clock.epochMillis();
        hosts.cut(3);
        long lost = awaitLine(sub, l -> l.startsWith("lost ") && epochOf(l) > cutAt, 20_000,
                "the unit host's client did not notice the partition within 20 s");
        long onN1 = awaitLine(sub, l -> l.startsWith("conn ") && epochOf(l) > cutAt, 20_000,
                "the unit host's client did not fail over to n1 during the partition");
        assertThat(lastConnUri(sub)).isEqualTo("tcp://" + hosts.address(1) + ":" + MQTT_PORT);
        figures.put("partitionDetectMs", lost - cutAt);
        figures.put("partitionFailoverMs", onN1 - cutAt);
        long quietFrom = clock.epochMillis();
        sleepMs(3000); // commands go on being sent on n3 and must not reach host 2 meanwhile
        long crossedDuringCut = lines(sub).stream().filter(l -> l.startsWith("recv ") && epochOf(l, 3) > quietFrom
                && epochOf(l, 3) < quietFrom + 3000).count();
        long healedAt = clock.epochMillis();
        hosts.heal(3);
        long flowing = awaitLine(sub, l -> l.startsWith("recv ") && epochOf(l, 3) > healedAt, 30_000,
                "commands did not reach host 2 again within 30 s of healing the partition");
        figures.put("healToFirstCommandMs", flowing - healedAt);
        figures.put("commandsCrossingDuringPartition", crossedDuringCut);
        assertSteadyFlow(pub, sub, "after the partition healed");

        for (int i : new int[] {1, 3}) {
            figures.put("n" + i + "CpuMsWhileRunning", (cpuTicks(nodes[i]) - cpuBeforeKill[i]) * 10); // 100 ticks/s
        }
        List<String> recv = lines(sub).stream().filter(l -> l.startsWith("recv ")).toList();
        Set<Long> seen = new HashSet<>();
        long duplicates = recv.stream().filter(l -> !seen.add(seqOf(l))).count();
        long late = recv.stream().filter(l -> epochOf(l, 3) > Long.parseLong(l.split(" ")[2])).count();
        long sent = lines(pub).stream().filter(l -> l.startsWith("sent ")).count();
        long refused = lines(pub).stream().filter(l -> l.startsWith("refused ")).count();
        figures.put("commandsSent", sent);
        figures.put("commandsRefusedAtSender", refused);
        figures.put("commandsReceivedDistinct", (long) seen.size());
        figures.put("commandsReceivedDuplicate", duplicates);
        figures.put("commandsReceivedAfterValidUntil", late);
        long[] latencyMs = recv.stream().mapToLong(l -> epochOf(l, 3) - epochOf(l, 5)).sorted().toArray();
        figures.put("commandLatencyP50Ms", latencyMs[latencyMs.length / 2]);
        figures.put("commandLatencyP99Ms", latencyMs[Math.min(latencyMs.length - 1, latencyMs.length * 99 / 100)]);
        figures.put("wallTimeMs", clock.epochMillis() - t0);
        String text = "three-node cluster figures: " + figures;
        System.out.println(text);
        Files.writeString(Path.of("target", "cluster-figures.txt"), text + "\n");

        // MQTT 5 message expiry (§3.3.2.3.3) = the command's validity: nothing older may be delivered
        assertThat(late).as("commands delivered after their validUntil").isZero();
        assertThat(crossedDuringCut).as("commands that crossed a cut link").isZero();
        assertThat(sent).isGreaterThanOrEqualTo(seen.size());
    }

    /**
     * Lets commands flow for {@link #STEADY_MS} and checks that every one sent in that window (less the
     * last few still on their way) arrived: QoS 1 between connected nodes loses nothing.
     */
    private void assertSteadyFlow(Path pub, Path sub, String phase) throws Exception {
        long from = clock.epochMillis();
        sleepMs(STEADY_MS);
        long to = clock.epochMillis() - 500;
        List<Long> sentInWindow = lines(pub).stream().filter(l -> l.startsWith("sent ") && epochOf(l, 2) >= from
                && epochOf(l, 2) <= to).map(ThreeNodeClusterTest::seqOf).toList();
        Set<Long> received = new HashSet<>(lines(sub).stream().filter(l -> l.startsWith("recv "))
                .map(ThreeNodeClusterTest::seqOf).toList());
        assertThat(sentInWindow).as("commands sent in a steady %d ms %s", STEADY_MS, phase).hasSizeGreaterThan(10);
        assertThat(received).as("every command sent in a steady window %s arrived", phase).containsAll(sentInWindow);
    }

    private String list(int... order) {
        List<String> uris = new ArrayList<>();
        for (int i : order) {
            uris.add("tcp://" + hosts.address(i) + ":" + MQTT_PORT);
        }
        return String.join(",", uris);
    }

    private Process startNode(int i, Path users, Path clusterPassword) throws IOException {
        List<String> peers = new ArrayList<>();
        for (int j = 1; j <= 3; j++) {
            if (j != i) {
                peers.add("--peer");
                peers.add(hosts.address(j) + ":" + CLUSTER_PORT);
            }
        }
        List<String> cmd = hosts.java(i, "-Xmx192m", "org.loopstand.brokernode.cli.BrokerNodeCli");
        cmd.addAll(List.of("--name", "n" + i, "--host", hosts.address(i), "--mqtt-port", "" + MQTT_PORT,
                "--cluster-port", "" + CLUSTER_PORT, "--config", CONFIG.toString(), "--users", users.toString(),
                "--cluster-password-file", clusterPassword.toString(), "--work-dir", dir.resolve("n" + i).toString()));
        cmd.addAll(peers);
        return launch(cmd, "n" + i);
    }

    private Path start(int host, String role, String clientId, String brokers) throws IOException {
        List<String> cmd = hosts.java(host, "-Xmx64m", ClusterProbe.class.getName());
        cmd.addAll(List.of(role, clientId, brokers, TOPIC, "rig-probe", "probe-password-0123456789",
                "" + PERIOD_MS, "" + VALIDITY_MS));
        launch(cmd, clientId);
        return dir.resolve(clientId + ".out");
    }

    private Process launch(List<String> cmd, String name) throws IOException {
        return children.launch(cmd, name);
    }

    /** @return the epoch ms at which a matching line was seen (its own stamp where it has one) */
    private long awaitLine(Path file, Predicate<String> match, long timeoutMs, String failure) throws Exception {
        long until = clock.epochMillis() + timeoutMs;
        while (clock.epochMillis() < until) {
            for (String l : lines(file)) {
                if (match.test(l)) {
                    String[] f = l.split(" ");
                    return l.startsWith("recv ") ? Long.parseLong(f[3])
                            : f.length > 1 && f[1].matches("\\d{13}") ? Long.parseLong(f[1]) : clock.epochMillis();
                }
            }
            sleepMs(50);
        }
        throw new AssertionError(failure + " (" + file.getFileName() + ":\n" + String.join("\n", tail(file)) + ")");
    }

    private static List<String> lines(Path file) throws IOException {
        return Files.exists(file) ? Files.readAllLines(file) : List.of();
    }

    private static List<String> tail(Path file) throws IOException {
        List<String> all = lines(file);
        return all.subList(Math.max(0, all.size() - 15), all.size());
    }

    private static long epochOf(String line) {
        return Long.parseLong(line.split(" ")[1]);
    }

    private static long epochOf(String line, int field) {
        return Long.parseLong(line.split(" ")[field]);
    }

    private static long seqOf(String line) {
        return Long.parseLong(line.split(" ")[1]);
    }

    private static long lastRecvSeq(Path sub) throws IOException {
        return lines(sub).stream().filter(l -> l.startsWith("recv ")).mapToLong(ThreeNodeClusterTest::seqOf).max()
                .orElse(0);
    }

    private static String lastConnUri(Path sub) throws IOException {
        List<String> conns = lines(sub).stream().filter(l -> l.startsWith("conn ")).toList();
        return conns.get(conns.size() - 1).split(" ")[2];
    }

    /** @return user + system CPU of a process, clock ticks (/proc/PID/stat fields 14 and 15) */
    private static long cpuTicks(Process p) throws IOException {
        Path stat = Path.of("/proc", Long.toString(p.pid()), "stat");
        if (!Files.exists(stat)) {
            return 0;
        }
        String s = Files.readString(stat);
        String[] f = s.substring(s.lastIndexOf(')') + 2).split(" ");
        return Long.parseLong(f[11]) + Long.parseLong(f[12]);
    }

    private static void sleepMs(long ms) throws InterruptedException {
        Thread.sleep(ms);
    }
}
