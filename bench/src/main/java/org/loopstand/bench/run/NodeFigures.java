package org.loopstand.bench.run;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Properties;
import java.util.TreeMap;
import java.util.concurrent.locks.LockSupport;
import org.loopstand.protocol.time.Clock;

/**
 * A broker node's own counters in the hosts bench (broker-node {@code CountersSnapshot}), ordered on the node's
 * standard input at the window's start and end and once more after every part stopped. Over the window: what the
 * node took from its MQTT clients and from its peers' bridges, what its subscription queues delivered to clients
 * and its bridge queues forwarded to peers, what it expired and killed, by topic family. Over the whole run (the
 * node's counts from its start): the commands it expired ({@code expired.*.command}: a command whose MQTT expiry,
 * its validity, ran out in a queue; correct behaviour, not a loss).
 *
 * @param name    n1, n2, n3
 * @param nodeId  the node's cluster id (its peers' bridge queues towards it are named by it)
 * @param window  end − start of every counter; gauges (what queues hold, address sizes) at the window's end, and
 *                at its start as {@code atStart.gauge.…}
 * @param whole   every counter at the final reading (from the node's start)
 */
record NodeFigures(String name, String nodeId, Map<String, Long> window, Map<String, Long> whole) {

    /** How long a node may take to write a reading, s (a starved node took more than 30 s at load 30). */
    static final long READING_WAIT_S = 90;

    /**
     * Orders a reading on every node and waits for the files.
     *
     * @return the nodes (n1..) that wrote none within {@link #READING_WAIT_S}: their threads are dumped to
     *         {@code node-NAME-threads-LABEL.txt} and the run goes on without that reading
     */
    static List<String> order(List<Process> nodes, Path dir, String label, Clock clock) throws IOException {
        for (int i = 0; i < nodes.size(); i++) {
            Files.deleteIfExists(file(dir, "n" + (i + 1), label));
            PrintWriter w = new PrintWriter(nodes.get(i).getOutputStream(), true, StandardCharsets.UTF_8);
            w.println("counters " + label);
        }
        long until = clock.monotonicNanos() + READING_WAIT_S * 1_000_000_000L;
        List<String> silent = new java.util.ArrayList<>();
        for (int i = 0; i < nodes.size(); i++) {
            String name = "n" + (i + 1);
            while (!Files.exists(file(dir, name, label)) && clock.monotonicNanos() < until) {
                LockSupport.parkNanos(50_000_000L);
            }
            if (!Files.exists(file(dir, name, label))) {
                silent.add(name);
                dumpThreads(nodes.get(i), dir.resolve("node-" + name + "-threads-" + label + ".txt"));
            }
        }
        return silent;
    }

    private static void dumpThreads(Process node, Path out) {
        try {
            new ProcessBuilder("jcmd", Long.toString(node.pid()), "Thread.print").redirectErrorStream(true)
                    .redirectOutput(out.toFile()).start().waitFor(60, java.util.concurrent.TimeUnit.SECONDS);
        } catch (IOException e) {
            // no jcmd: the missing reading is reported all the same
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /**
     * Waits until every node has its cluster bridges to both peers connected, reading their counters every 2 s.
     * Seen at load 28–32: two nodes' bridges to the third timed out (3 s connection TTL) while the JVMs were starting
     * and never connected again; that node's clients' messages then found no subscriber for the whole run.
     *
     * @return seconds waited
     * @throws IllegalStateException naming the nodes short of bridges after {@code waitS}
     */
    static double awaitCluster(List<Process> nodes, Path dir, long waitS, Clock clock) throws IOException {
        long t0 = clock.monotonicNanos();
        for (int k = 0; ; k++) {
            String label = "formed-" + k;
            List<String> silent = order(nodes, dir, label, clock);
            StringBuilder shortOf = new StringBuilder();
            for (int i = 1; i <= nodes.size(); i++) {
                if (silent.contains("n" + i)) {
                    shortOf.append(" n").append(i).append(" did not answer");
                    continue;
                }
                long b = Long.parseLong(load(file(dir, "n" + i, label)).getOrDefault("gauge.bridgesConnected", "0"));
                if (b < nodes.size() - 1) {
                    shortOf.append(" n").append(i).append(" has ").append(b).append(" of ").append(nodes.size() - 1);
                }
                Files.deleteIfExists(file(dir, "n" + i, label));
            }
            double waited = (clock.monotonicNanos() - t0) / 1e9;
            if (shortOf.length() == 0) {
                return waited;
            }
            if (waited > waitS) {
                throw new IllegalStateException("the broker cluster did not form within " + waitS + " s:" + shortOf
                        + " bridges to its peers connected (see node-n*.log: AMQ221027 is a bridge connected)");
            }
            LockSupport.parkNanos(2_000_000_000L);
        }
    }

    static Path file(Path dir, String node, String label) {
        return dir.resolve("counters-" + node + "-" + label + ".properties");
    }

    /** @return the node's figures; a reading it did not write counts as empty (its figures then read 0 or −1) */
    static NodeFigures read(Path dir, String node) throws IOException {
        Map<String, String> start = loadIfWritten(file(dir, node, "start"));
        Map<String, String> end = loadIfWritten(file(dir, node, "end"));
        Map<String, String> last = loadIfWritten(file(dir, node, "final"));
        Map<String, Long> window = new TreeMap<>();
        for (Map.Entry<String, String> e : end.entrySet()) {
            if (e.getKey().equals("nodeId")) {
                continue;
            }
            long v = Long.parseLong(e.getValue());
            window.put(e.getKey(), e.getKey().startsWith("gauge.") ? v : v - Long.parseLong(start.getOrDefault(e.getKey(), "0")));
        }
        // what sat in the queues when the window started: a backlog left from the set-up drains into the window
        start.forEach((k, v) -> {
            if (k.startsWith("gauge.")) {
                window.put("atStart." + k, Long.parseLong(v));
            }
        });
        Map<String, Long> whole = new TreeMap<>();
        last.forEach((k, v) -> {
            if (!k.equals("nodeId")) {
                whole.put(k, Long.parseLong(v));
            }
        });
        String id = end.getOrDefault("nodeId", last.getOrDefault("nodeId", start.getOrDefault("nodeId", "?")));
        if (start.isEmpty() || end.isEmpty()) {
            window.clear();
            window.put("readingMissing", 1L);
        }
        // Artemis counts no message its DROP policy dropped; it logs AMQ222039 when an address becomes full
        Path log = dir.resolve("node-" + node + ".log");
        long full = Files.exists(log) ? Files.readAllLines(log, StandardCharsets.UTF_8).stream()
                .filter(l -> l.contains("AMQ222039")).count() : -1;
        whole.put("log.addressFullDropping", full);
        return new NodeFigures(node, id, window, whole);
    }

    private static Map<String, String> loadIfWritten(Path f) throws IOException {
        return Files.exists(f) ? load(f) : new TreeMap<>();
    }

    private static Map<String, String> load(Path f) throws IOException {
        Properties p = new Properties();
        try (Reader r = Files.newBufferedReader(f, StandardCharsets.UTF_8)) {
            p.load(r);
        }
        Map<String, String> m = new TreeMap<>();
        // a value that is not a number (a key that held '=' before families were cleaned) is left out
        p.stringPropertyNames().stream().filter(k -> k.equals("nodeId") || p.getProperty(k).matches("-?\\d+"))
                .forEach(k -> m.put(k, p.getProperty(k)));
        return m;
    }

    /** @return the sum of the window's counters whose key starts with the prefix (and ends with the suffix) */
    long windowSum(String prefix, String suffix) {
        return sum(window, prefix, suffix);
    }

    long wholeSum(String prefix, String suffix) {
        return sum(whole, prefix, suffix);
    }

    private static long sum(Map<String, Long> m, String prefix, String suffix) {
        return m.entrySet().stream().filter(e -> e.getKey().startsWith(prefix) && e.getKey().endsWith(suffix))
                .mapToLong(Map.Entry::getValue).sum();
    }

    /**
     * @param names node id → node name, for the bridge queues
     * @return the window's figures of this node: messages in from clients and peers, delivered to clients, forwarded
     *         to each peer, expired, killed, held at the end, and whether any address was full (DROP)
     */
    Map<String, Long> summary(Map<String, String> names) {
        Map<String, Long> s = new LinkedHashMap<>();
        if (window.containsKey("readingMissing")) {
            s.put("readingMissing", 1L);
        }
        s.put("fromClients", windowSum("count.in.client.", ""));
        s.put("fromPeers", windowSum("count.in.peer.", ""));
        s.put("noSubscriber", windowSum("count.noSubscriber.", ""));
        s.put("duplicateDropped", windowSum("count.duplicate.", ""));
        s.put("toClients", windowSum("queue.subscription.", ".acked"));
        s.put("toPeers", windowSum("queue.bridge.", ".acked"));
        names.forEach((id, peer) -> {
            if (window.containsKey("queue.bridge." + id + ".acked")) {
                s.put("to" + peer, window.get("queue.bridge." + id + ".acked"));
            }
        });
        s.put("expired", windowSum("count.expired.", ""));
        s.put("expiredCommands", windowSum("count.expired.", ".command"));
        s.put("killed", windowSum("count.killed.", ""));
        s.put("heldInSubscriptionsAtStart", windowSum("atStart.gauge.queue.subscription.", ".held"));
        s.put("heldInBridgesAtStart", windowSum("atStart.gauge.queue.bridge.", ".held"));
        s.put("heldInSubscriptionsAtEnd", windowSum("gauge.queue.subscription.", ".held"));
        s.put("heldInBridgesAtEnd", windowSum("gauge.queue.bridge.", ".held"));
        s.put("addressesFullAtEnd", window.getOrDefault("gauge.addressesFull", 0L));
        s.put("bridgesConnectedAtEnd", window.getOrDefault("gauge.bridgesConnected", -1L));
        s.put("addressBytesMaxAtEnd", window.getOrDefault("gauge.addressBytesMax", 0L));
        s.put("commandsExpiredWholeRun", wholeSum("count.expired.", ".command"));
        s.put("commandsFromClientsWholeRun", wholeSum("count.in.client.command", ""));
        s.put("addressesDroppingWholeRun", whole.getOrDefault("log.addressFullDropping", -1L));
        return s;
    }

    /** @return the window's counts by topic family: in from clients, in from peers, delivered to clients */
    Map<String, Map<String, Long>> byFamily() {
        Map<String, Map<String, Long>> f = new TreeMap<>();
        window.forEach((k, v) -> {
            String[] p = k.split("\\.");
            if (k.startsWith("count.in.") && p.length == 4) {
                f.computeIfAbsent(p[3], x -> new TreeMap<>()).merge(p[2].equals("client") ? "fromClients" : "fromPeers", v, Long::sum);
            } else if (k.startsWith("count.expired.") && p.length == 4) {
                f.computeIfAbsent(p[3], x -> new TreeMap<>()).merge("expired", v, Long::sum);
            } else if (k.startsWith("queue.subscription.") && k.endsWith(".acked") && p.length == 4) {
                f.computeIfAbsent(p[2], x -> new TreeMap<>()).merge("toClients", v, Long::sum);
            }
        });
        return f;
    }

    /**
     * Commands that expired in a node on their way to the unit's own interface, over the whole run. A command goes
     * to every subscriber of the command wildcard (both unit hosts); the copy that counts is the one in the queue of
     * the unit's own host: its subscription queue (client id {@code clientPrefix(host)…}) or the bridge queue towards
     * that host's node.
     *
     * @param hostOfUnit    unit id → its unit host (0, 1)
     * @param clientPrefix  per unit host, the prefix of its connections' client ids
     * @param nodeIdOfHost  per unit host, the id of the node it connects to first
     */
    static long commandsExpiredTowardsTheirUnit(List<NodeFigures> nodes, Map<String, Integer> hostOfUnit,
                                                List<String> clientPrefix, List<String> nodeIdOfHost) {
        long n = 0;
        for (NodeFigures node : nodes) {
            for (Map.Entry<String, Long> e : node.whole.entrySet()) {
                String[] p = e.getKey().split("\\.");
                if (p.length != 4 || !p[0].equals("count") || !p[1].equals("expiredCommand")) {
                    continue;
                }
                Integer host = hostOfUnit.get(p[3]);
                if (host != null && (p[2].startsWith(clientPrefix.get(host)) || p[2].equals("bridge-" + nodeIdOfHost.get(host)))) {
                    n += e.getValue();
                }
            }
        }
        return n;
    }
}
