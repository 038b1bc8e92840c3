package org.loopstand.plant.network;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

import org.loopstand.plant.fault.HostLinks;
import org.loopstand.plant.fault.NetworkFault;
import org.loopstand.protocol.config.ConfigFileException;
import org.loopstand.protocol.config.MappingReader;
import org.loopstand.protocol.config.YamlNode;

/**
 * Host links of hosts that are network namespaces on one machine (or interfaces of this machine): a
 * hosts file names the hosts and, for each pair a fault may cut, the interfaces that carry their link
 * and the namespace they live in. A partition sets those interfaces down ({@code ip link set IF down})
 * and up again when it ends; a delay/loss fault puts a netem qdisc on them ({@code tc qdisc replace dev
 * IF root netem …}) and deletes it at the end. Needs CAP_NET_ADMIN (root). Whether the kernel offers
 * netem is asked once, when a scenario names a delay/loss fault: a kernel without it refuses the
 * scenario before the run.
 *
 * <pre>
 * hosts: [plant-host, unit-host, control-host]
 * links:
 *   - {between: [plant-host, control-host], namespace: lab-hub, interfaces: [hub-p3]}
 * </pre>
 */
public final class NamespaceHostLinks implements HostLinks {
    /** One cuttable link: its two hosts, the namespace of its interfaces ("" = this process's own), the interfaces. */
    record Link(String hostA, String hostB, String namespace, List<String> interfaces) {
        boolean joins(String a, String b) {
            return (hostA.equals(a) && hostB.equals(b)) || (hostA.equals(b) && hostB.equals(a));
        }
    }

    private final Set<String> hosts;
    private final List<Link> links;
    private final CommandRunner runner;
    private final Map<String, Optional<String>> netemRefusal = new LinkedHashMap<>();

    NamespaceHostLinks(Set<String> hosts, List<Link> links, CommandRunner runner) {
        this.hosts = Set.copyOf(hosts);
        this.links = List.copyOf(links);
        this.runner = runner;
    }

    /** Reads a hosts file whose links are changed by running {@code ip} and {@code tc}. */
    public static NamespaceHostLinks read(Path file) {
        return read(file, CommandRunner.SYSTEM);
    }

    /**
     * Reads a hosts file with the shared reader.
     *
     * @throws ConfigFileException listing every problem as file:line:column
     */
    public static NamespaceHostLinks read(Path file, CommandRunner runner) {
        List<String> problems = new ArrayList<>();
        MappingReader top = new MappingReader(YamlNode.read(file), "hosts file", problems);
        Set<String> hosts = new LinkedHashSet<>();
        for (YamlNode n : top.sequence("hosts", true)) {
            if (n instanceof YamlNode.Scalar s && !s.text().isBlank() && hosts.add(s.text())) {
                continue;
            }
            problems.add(n.location() + ": hosts: each host is a name, named once");
        }
        List<Link> links = new ArrayList<>();
        for (MappingReader r : top.mappings("links", true, "link")) {
            List<String> between = texts(r, "between", problems);
            String namespace = r.optionalString("namespace", "");
            List<String> interfaces = texts(r, "interfaces", problems);
            r.finish();
            if (between.size() != 2 || between.get(0).equals(between.get(1))) {
                problems.add(r.locationOf("between") + ": " + r.what() + ": between names two different hosts, got " + between);
                continue;
            }
            between.stream().filter(h -> !hosts.contains(h)).forEach(h -> problems.add(r.locationOf("between") + ": "
                    + r.what() + ": unknown host '" + h + "' (hosts: " + hosts + ")"));
            if (interfaces.isEmpty()) {
                problems.add(r.location() + ": " + r.what() + ": needs at least one interface");
            }
            links.add(new Link(between.get(0), between.get(1), namespace, interfaces));
        }
        top.finish();
        ConfigFileException.throwIfAny(problems);
        return new NamespaceHostLinks(hosts, links, runner);
    }

    private static List<String> texts(MappingReader r, String key, List<String> problems) {
        List<String> out = new ArrayList<>();
        for (YamlNode n : r.sequence(key, true)) {
            if (n instanceof YamlNode.Scalar s && !s.text().isBlank()) {
                out.add(s.text());
            } else {
                problems.add(n.location() + ": " + r.what() + ": " + key + " must be a list of names");
            }
        }
        return out;
    }

    @Override
    public Set<String> hosts() {
        return hosts;
    }

    @Override
    public Optional<String> cannotApply(NetworkFault fault, String hostA, String hostB) {
        Optional<Link> link = link(hostA, hostB);
        if (link.isEmpty()) {
            return Optional.of("the hosts file names no link between " + hostA + " and " + hostB);
        }
        Link l = link.get();
        for (String i : l.interfaces()) {
            CommandRunner.Result r = runner.run(ip(l, "link", "show", i));
            if (!r.ok()) {
                return Optional.of("interface " + name(l, i) + " not found (" + r.output() + ")");
            }
        }
        if (fault instanceof NetworkFault.DelayLoss) {
            return netemRefusal.computeIfAbsent(name(l, l.interfaces().get(0)), k -> probeNetem(l));
        }
        return Optional.empty();
    }

    /** Puts a netem qdisc on the link's first interface and takes it off again: refused = no netem here. */
    private Optional<String> probeNetem(Link l) {
        String i = l.interfaces().get(0);
        CommandRunner.Result add = runner.run(tc(l, "qdisc", "replace", "dev", i, "root", "netem", "delay", "0ms"));
        if (!add.ok()) {
            return Optional.of("this kernel offers no netem qdisc for delay and loss (tc said: " + add.output()
                    + "); only partitions (link down) can be applied");
        }
        runner.run(tc(l, "qdisc", "del", "dev", i, "root"));
        return Optional.empty();
    }

    @Override
    public List<String> apply(NetworkFault fault, String hostA, String hostB) {
        Link l = link(hostA, hostB).orElseThrow(() -> new HostLinkException("no link between " + hostA + " and " + hostB));
        for (String i : l.interfaces()) {
            if (fault instanceof NetworkFault.DelayLoss d) {
                must(tc(l, "qdisc", "replace", "dev", i, "root", "netem", "delay", ms(d.delayMs()), ms(d.jitterMs()),
                        "loss", String.format(Locale.ROOT, "%.4f%%", d.lossProbability() * 100)));
            } else {
                must(ip(l, "link", "set", i, "down"));
            }
        }
        return names(l);
    }

    @Override
    public List<String> lift(NetworkFault fault, String hostA, String hostB) {
        Link l = link(hostA, hostB).orElseThrow(() -> new HostLinkException("no link between " + hostA + " and " + hostB));
        for (String i : l.interfaces()) {
            must(fault instanceof NetworkFault.DelayLoss ? tc(l, "qdisc", "del", "dev", i, "root") : ip(l, "link", "set", i, "up"));
        }
        return names(l);
    }

    private void must(List<String> command) {
        CommandRunner.Result r = runner.run(command);
        if (!r.ok()) {
            throw new HostLinkException(String.join(" ", command) + " failed (exit " + r.exitCode() + "): " + r.output());
        }
    }

    private Optional<Link> link(String a, String b) {
        return links.stream().filter(l -> l.joins(a, b)).findFirst();
    }

    private static List<String> ip(Link l, String... args) {
        return withNamespace("ip", l, args);
    }

    private static List<String> tc(Link l, String... args) {
        return withNamespace("tc", l, args);
    }

    private static List<String> withNamespace(String tool, Link l, String... args) {
        List<String> cmd = new ArrayList<>(List.of(tool));
        if (!l.namespace().isEmpty()) {
            cmd.addAll(List.of("-n", l.namespace()));
        }
        cmd.addAll(List.of(args));
        return cmd;
    }

    private static String ms(double v) {
        return Math.round(v) + "ms";
    }

    private static List<String> names(Link l) {
        return l.interfaces().stream().map(i -> name(l, i)).toList();
    }

    private static String name(Link l, String i) {
        return l.namespace().isEmpty() ? i : l.namespace() + "/" + i;
    }
}
