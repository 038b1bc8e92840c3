package org.loopstand.protocol.bus.mqtt;

import java.net.URI;
import java.net.URISyntaxException;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * The broker nodes a link may connect to, in failover order: one URI, or a comma-separated list such
 * as {@code tcp://10.0.0.1:1883,tcp://10.0.0.2:1883,tcp://10.0.0.3:1883} (the nodes of one broker
 * cluster). A link starts at the first node and, when a node is lost or refuses, goes on to the next
 * one, wrapping round after the last.
 *
 * @param uris one or more {@code tcp://host:port} or {@code ssl://host:port}, all of one scheme, no repeats
 */
public record BrokerEndpoints(List<String> uris) {
    public BrokerEndpoints {
        uris = List.copyOf(uris);
        if (uris.isEmpty()) {
            throw new IllegalArgumentException("no broker URI given");
        }
    }

    /**
     * @param list one URI or a comma-separated list (blanks around commas are ignored)
     * @throws IllegalArgumentException naming every entry that is wrong
     */
    public static BrokerEndpoints parse(String list) {
        List<String> problems = new ArrayList<>();
        List<String> uris = parse(list, problems);
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("invalid broker list '" + list + "': " + String.join("; ", problems));
        }
        return new BrokerEndpoints(uris);
    }

    /** Parses into {@code problems} instead of throwing; returns the good entries. */
    static List<String> parse(String list, List<String> problems) {
        List<String> uris = new ArrayList<>();
        if (list == null || list.isBlank()) {
            problems.add("serverUri is missing");
            return uris;
        }
        Set<String> seen = new LinkedHashSet<>();
        Set<String> schemes = new LinkedHashSet<>();
        String[] parts = list.split(",", -1);
        for (int i = 0; i < parts.length; i++) {
            String u = parts[i].strip();
            String where = parts.length > 1 ? "broker #" + (i + 1) + " " : "";
            if (u.isEmpty()) {
                problems.add(where + "is empty");
                continue;
            }
            if (!u.startsWith("tcp://") && !u.startsWith("ssl://")) {
                problems.add(where + "serverUri must start with tcp:// or ssl://, got '" + u + "'");
                continue;
            }
            try {
                URI uri = new URI(u);
                if (uri.getHost() == null || uri.getPort() < 1 || uri.getPort() > 65_535) {
                    problems.add(where + "serverUri needs a host and a port in 1..65535, got '" + u + "'");
                    continue;
                }
            } catch (URISyntaxException e) {
                problems.add(where + "serverUri is not a URI: " + e.getMessage());
                continue;
            }
            if (!seen.add(u.toLowerCase(Locale.ROOT))) {
                problems.add(where + "'" + u + "' is listed twice");
                continue;
            }
            schemes.add(u.substring(0, 3));
            uris.add(u);
        }
        if (schemes.size() > 1) {
            problems.add("mixes tcp:// and ssl:// nodes; every node of one list must use the same scheme");
        }
        return uris;
    }

    /** @return the first node: where a link connects first */
    public String first() {
        return uris.get(0);
    }

    /** @return number of nodes, ≥ 1 */
    public int size() {
        return uris.size();
    }

    /** @param index 0..size()-1 @return that node's URI */
    public String get(int index) {
        return uris.get(index);
    }

    /** @return the index tried after {@code index}: the next node, wrapping round to the first */
    public int next(int index) {
        return (index + 1) % uris.size();
    }

    /** @return true when every node is {@code ssl://} */
    public boolean isTls() {
        return uris.get(0).startsWith("ssl://");
    }

    /** @return host of each node, in failover order */
    public List<String> hosts() {
        return uris.stream().map(u -> URI.create(u).getHost()).toList();
    }

    /** @return the list as given to {@link #parse}, comma-separated */
    @Override
    public String toString() {
        return String.join(",", uris);
    }
}
