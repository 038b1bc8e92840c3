package org.loopstand.brokernode;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.loopstand.protocol.security.AuthPolicy;

/**
 * What one broker node is started with. {@link #check()} names every setting that is wrong.
 *
 * @param nodeName            unique name in the cluster, letters, digits, '-' (e.g. n1)
 * @param host                address to listen on: the host's own address, or a loopback address
 * @param mqttPort            MQTT listener port, 1..65535
 * @param clusterPort         node-to-node listener port, 1..65535, not the MQTT port
 * @param peers               the two other nodes' cluster listeners, host:port each
 * @param configFile          the Artemis broker file with ${...} placeholders (config/broker/artemis/broker-node.xml)
 * @param usersFile           MQTT users (username = password a line); null = no login (loopback only)
 * @param clusterPasswordFile first line: the password the nodes log in to each other with; null on loopback only
 * @param keyStore            PKCS#12 (.p12/.pfx) or JKS key store with this node's certificate and key: the MQTT
 *                            listener speaks TLS; null = plain MQTT
 * @param keyStorePasswordFile first line: the key store's password; needed with a key store
 */
public record BrokerNodeSettings(String nodeName, String host, int mqttPort, int clusterPort, List<String> peers,
                                 Path configFile, Path usersFile, Path clusterPasswordFile, Path keyStore,
                                 Path keyStorePasswordFile) {
    /** Name the nodes log in to each other with. */
    public static final String CLUSTER_USER = "loopstand-cluster";
    /** Used only between loopback nodes that were given no cluster password file. */
    static final String LOOPBACK_CLUSTER_PASSWORD = "loopback-only-cluster-password";

    public BrokerNodeSettings {
        peers = List.copyOf(Objects.requireNonNull(peers, "peers"));
    }

    /** @return every problem, each naming the setting and the fix; empty when all is well */
    public List<String> check() {
        List<String> problems = new ArrayList<>();
        if (nodeName == null || !nodeName.matches("[A-Za-z0-9-]{1,64}")) {
            problems.add("--name must be 1..64 letters, digits or '-', got '" + nodeName + "'");
        }
        if (host == null || host.isBlank()) {
            problems.add("--host is missing");
        }
        checkPort("--mqtt-port", mqttPort, problems);
        checkPort("--cluster-port", clusterPort, problems);
        if (mqttPort == clusterPort) {
            problems.add("--mqtt-port and --cluster-port must differ, both are " + mqttPort);
        }
        if (peers.size() != 2) {
            problems.add("a three-node cluster needs exactly two --peer host:port, got " + peers.size() + " " + peers);
        }
        for (String p : peers) {
            int colon = p.lastIndexOf(':');
            if (colon < 1 || !p.substring(colon + 1).matches("\\d{1,5}")
                    || Integer.parseInt(p.substring(colon + 1)) < 1 || Integer.parseInt(p.substring(colon + 1)) > 65_535) {
                problems.add("--peer must be host:port with a port in 1..65535, got '" + p + "'");
            }
        }
        if (configFile == null || !Files.isReadable(configFile)) {
            problems.add("--config " + configFile + " does not exist or is not readable");
        }
        boolean loopback = AuthPolicy.isLoopback(host);
        if (!loopback && usersFile == null) {
            problems.add("node listens on " + host + ", not loopback: give --users FILE so every MQTT client must log in");
        }
        if (!loopback && clusterPasswordFile == null) {
            problems.add("node listens on " + host + ", not loopback: give --cluster-password-file FILE (the same on"
                    + " every node)");
        }
        checkReadable("--users", usersFile, problems);
        checkReadable("--cluster-password-file", clusterPasswordFile, problems);
        checkReadable("--key-store", keyStore, problems);
        checkReadable("--key-store-password-file", keyStorePasswordFile, problems);
        if ((keyStore == null) != (keyStorePasswordFile == null)) {
            problems.add("--key-store and --key-store-password-file go together");
        }
        return problems;
    }

    /** @return true when clients connect without a login (loopback without a users file) */
    public boolean insecure() {
        return usersFile == null;
    }

    /** @return true when the MQTT listener speaks TLS */
    public boolean tls() {
        return keyStore != null;
    }

    /**
     * @param keyStorePassword the key store's password, or null without TLS
     * @return the ${...} values of the broker file, by placeholder name
     * @throws IllegalArgumentException for a key store password the acceptor URL cannot carry
     */
    Map<String, String> placeholders(String clusterPassword, String keyStorePassword) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("node.name", nodeName);
        m.put("node.host", host);
        m.put("mqtt.port", Integer.toString(mqttPort));
        m.put("cluster.port", Integer.toString(clusterPort));
        m.put("peer1.address", peers.get(0));
        m.put("peer2.address", peers.get(1));
        m.put("security.enabled", Boolean.toString(!insecure()));
        m.put("cluster.user", CLUSTER_USER);
        m.put("cluster.password", clusterPassword);
        m.put("mqtt.tls", tls() ? tlsParameters(keyStorePassword) : "");
        return m;
    }

    private String tlsParameters(String keyStorePassword) {
        if (keyStorePassword == null || keyStorePassword.matches(".*[;=&].*")) {
            throw new IllegalArgumentException("--key-store-password-file: the password must not contain ';', '=' or '&'"
                    + " (the listener's settings carry it)");
        }
        String name = keyStore.getFileName().toString().toLowerCase(java.util.Locale.ROOT);
        String type = name.endsWith(".p12") || name.endsWith(".pfx") ? "PKCS12" : "JKS";
        return ";sslEnabled=true;keyStoreType=" + type + ";keyStorePath=" + keyStore.toAbsolutePath()
                + ";keyStorePassword=" + keyStorePassword;
    }

    /** @return the MQTT address clients use, tcp://host:port or ssl://host:port */
    public String mqttUri() {
        String h = host.contains(":") && !host.startsWith("[") ? "[" + host + "]" : host;
        return (tls() ? "ssl://" : "tcp://") + h + ":" + mqttPort;
    }

    private static void checkPort(String option, int port, List<String> problems) {
        if (port < 1 || port > 65_535) {
            problems.add(option + " must be in 1..65535, got " + port);
        }
    }

    private static void checkReadable(String option, Path file, List<String> problems) {
        if (file != null && !Files.isReadable(file)) {
            problems.add(option + " " + file + " does not exist or is not readable");
        }
    }
}
