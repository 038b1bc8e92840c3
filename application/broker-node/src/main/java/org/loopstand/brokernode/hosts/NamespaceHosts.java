package org.loopstand.brokernode.hosts;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Hosts on one machine for tests and the hosts bench: a network namespace per host, each joined by a veth pair to a
 * bridge in a hub namespace, addresses 10.231.0.1, .2, ... /24. Needs root and iproute2. Every address
 * lives inside these namespaces; nothing is added to the machine's own network. Cutting a host's link
 * ({@link #cut}) is the partition: this kernel offers no netem qdisc ("Specified qdisc kind is
 * unknown"), so delay and loss are not available, only link down.
 */
public final class NamespaceHosts implements AutoCloseable {
    private final String prefix;
    private final int count;
    private final List<String> created = new ArrayList<>();

    private NamespaceHosts(String prefix, int count) {
        this.prefix = prefix;
        this.count = count;
    }

    /**
     * @param prefix a few letters and digits, unique per test run (names must stay under 16 characters)
     * @throws IllegalStateException with the command and its output when a namespace cannot be made
     */
    public static NamespaceHosts create(String prefix, int count) {
        NamespaceHosts h = new NamespaceHosts(prefix, count);
        try {
            String hub = h.hub();
            h.run("ip", "netns", "add", hub);
            h.created.add(hub);
            h.run("ip", "-n", hub, "link", "add", "br0", "type", "bridge");
            h.run("ip", "-n", hub, "link", "set", "br0", "up");
            for (int i = 1; i <= count; i++) {
                String ns = h.host(i);
                h.run("ip", "netns", "add", ns);
                h.created.add(ns);
                h.run("ip", "-n", hub, "link", "add", h.hubSide(i), "type", "veth", "peer", "name", "eth0", "netns", ns);
                h.run("ip", "-n", hub, "link", "set", h.hubSide(i), "master", "br0");
                h.run("ip", "-n", hub, "link", "set", h.hubSide(i), "up");
                h.run("ip", "-n", ns, "addr", "add", h.address(i) + "/24", "dev", "eth0");
                h.run("ip", "-n", ns, "link", "set", "eth0", "up");
                h.run("ip", "-n", ns, "link", "set", "lo", "up");
            }
            return h;
        } catch (RuntimeException e) {
            h.close();
            throw e;
        }
    }

    /**
     * @param family a few letters that start every name a kind of owner makes (the bench's, the tests')
     * @param count  hosts, 1 – 9
     * @return hosts named after this process ({@code family}, its pid, {@code tag}), so that a later run can
     *         tell them from a live owner's ({@link #sweepOrphans})
     */
    public static NamespaceHosts forThisProcess(String family, char tag, int count) {
        if (!family.matches("[a-z]{1,3}") || tag < 'a' || tag > 'z' || count < 1 || count > 9) {
            throw new IllegalArgumentException("family must be 1-3 letters a-z, tag a letter a-z and count 1-9, got '"
                    + family + "', '" + tag + "', " + count);
        }
        return create(family + ProcessHandle.current().pid() + tag, count);
    }

    /**
     * Removes the namespaces of a {@code family} whose owning process is gone (a bench or test JVM killed before
     * it could clean up), first killing whatever still runs inside them (broker nodes, parts). Namespaces of
     * live owners are left alone.
     *
     * @return the namespaces removed, each with the processes killed in it
     */
    public static List<String> sweepOrphans(String family) {
        Pattern name = Pattern.compile(Pattern.quote(family) + "(\\d+)[a-z](hub|h\\d)");
        List<String> swept = new ArrayList<>();
        for (String line : output("ip", "netns", "list").split("\n")) {
            String ns = line.strip().split("\\s+")[0];
            Matcher m = name.matcher(ns);
            if (!m.matches() || ProcessHandle.of(Long.parseLong(m.group(1))).map(ProcessHandle::isAlive).orElse(false)) {
                continue;
            }
            List<String> killed = new ArrayList<>();
            for (String pid : output("ip", "netns", "pids", ns).split("\\s+")) {
                if (!pid.isBlank()) {
                    ProcessHandle.of(Long.parseLong(pid)).ifPresent(ProcessHandle::destroyForcibly);
                    killed.add(pid);
                }
            }
            try {
                output("ip", "netns", "del", ns);
                swept.add(ns + (killed.isEmpty() ? "" : " (killed " + String.join(", ", killed) + ")"));
            } catch (IllegalStateException e) {
                swept.add(ns + " not removed: " + e.getMessage());
            }
        }
        return swept;
    }

    public String hub() {
        return prefix + "hub";
    }

    /** @param i 1..count @return the namespace name of host i */
    public String host(int i) {
        return prefix + "h" + i;
    }

    /** @param i 1..count @return host i's address */
    public String address(int i) {
        return "10.231.0." + i;
    }

    /** @return host i's port on the hub's bridge (the hub side of its veth pair) */
    public String hubSide(int i) {
        return prefix + "p" + i;
    }

    /** Partition: host i's link to the others goes down (its own processes still reach each other). */
    public void cut(int i) {
        run("ip", "-n", hub(), "link", "set", hubSide(i), "down");
    }

    /** Heals {@link #cut}. */
    public void heal(int i) {
        run("ip", "-n", hub(), "link", "set", hubSide(i), "up");
    }

    /**
     * Writes a hosts file for the plant's network faults (docs/faults.md, "Network faults"): host i is
     * {@code names.get(i - 1)}; the link between hosts a and b is host {@code port}'s port on the bridge,
     * so cutting it cuts host {@code port} from every other host.
     */
    public Path writeHostsFile(Path file, List<String> names, int a, int b, int port) throws IOException {
        return java.nio.file.Files.writeString(file, "hosts: [" + String.join(", ", names) + "]\nlinks:\n  - {between: ["
                + names.get(a - 1) + ", " + names.get(b - 1) + "], namespace: " + hub() + ", interfaces: [" + hubSide(port)
                + "]}\n");
    }

    /** @return the command prefix that runs a program inside host i */
    public List<String> exec(int i) {
        return List.of("ip", "netns", "exec", host(i));
    }

    /**
     * @return the command that runs {@code main} of this JVM's class path (under Surefire: the test class path) in a
     *         JVM inside host i, with the given JVM options
     */
    public List<String> java(int i, List<String> jvmOptions, String main) {
        List<String> cmd = new ArrayList<>(exec(i));
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.addAll(jvmOptions);
        cmd.addAll(List.of("-cp", System.getProperty("surefire.test.class.path", System.getProperty("java.class.path")), main));
        return cmd;
    }

    /** @return the command that runs {@code main} of the test class path in a JVM inside host i */
    public List<String> java(int i, String heap, String main) {
        return java(i, List.of(heap, "-XX:+UseSerialGC", "-XX:TieredStopAtLevel=1"), main);
    }

    public void run(String... command) {
        output(command);
    }

    /** Runs {@code command} (10 s at most) and returns its output; fails with both when it exits non-zero. */
    private static String output(String... command) {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
            String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).strip();
            if (!p.waitFor(10, TimeUnit.SECONDS) || p.exitValue() != 0) {
                throw new IllegalStateException(String.join(" ", command) + " failed: " + out);
            }
            return out;
        } catch (IOException e) {
            throw new IllegalStateException(String.join(" ", command) + " could not run: " + e.getMessage(), e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted", e);
        }
    }

    @Override
    public void close() {
        for (int i = created.size() - 1; i >= 0; i--) {
            try {
                run("ip", "netns", "del", created.get(i));
            } catch (IllegalStateException e) {
                System.err.println("cleanup: " + e.getMessage());
            }
        }
        created.clear();
    }

    public int count() {
        return count;
    }
}
