package org.loopstand.brokernode;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.activemq.artemis.core.config.impl.SecurityConfiguration;
import org.apache.activemq.artemis.core.server.embedded.EmbeddedActiveMQ;
import org.apache.activemq.artemis.spi.core.security.ActiveMQJAASSecurityManager;
import org.apache.activemq.artemis.spi.core.security.jaas.InVMLoginModule;
import org.loopstand.brokernode.counters.CountersSnapshot;
import org.loopstand.brokernode.counters.NodeCounters;
import org.loopstand.protocol.security.LinkSecurity;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * One node of the rig's clustered MQTT 5 broker: an embedded Apache ActiveMQ Artemis server made from
 * the shipped broker file ({@code config/broker/artemis/broker-node.xml}) with this node's values put
 * into its placeholders. With a users file every MQTT client logs in (one role, "rig", for all of them);
 * the nodes log in to each other with {@link BrokerNodeSettings#CLUSTER_USER}.
 */
public final class BrokerNode implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(BrokerNode.class);
    private static final Pattern PLACEHOLDER = Pattern.compile("\\$\\{([a-z0-9.]+)}");
    private static final String ROLE = "rig";

    private final BrokerNodeSettings settings;
    private final EmbeddedActiveMQ server = new EmbeddedActiveMQ();
    private final NodeCounters counters = new NodeCounters();

    private BrokerNode(BrokerNodeSettings settings) {
        this.settings = settings;
    }

    /**
     * @param workDir where the node's filled-in broker file is written
     * @throws IllegalArgumentException naming every bad setting, or a placeholder the settings do not fill
     */
    public static BrokerNode start(BrokerNodeSettings settings, Path workDir) throws Exception {
        List<String> problems = settings.check();
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("broker node refuses to start: " + String.join("; ", problems));
        }
        String clusterPassword = settings.clusterPasswordFile() == null ? BrokerNodeSettings.LOOPBACK_CLUSTER_PASSWORD
                : firstLine(settings.clusterPasswordFile(), "--cluster-password-file");
        Path filled = workDir.resolve("broker-" + settings.nodeName() + ".xml");
        Files.createDirectories(workDir);
        // it holds the cluster password: owner only, set before the content goes in
        Files.deleteIfExists(filled);
        Files.createFile(filled, PosixFilePermissions.asFileAttribute(PosixFilePermissions.fromString("rw-------")));
        String keyStorePassword = settings.keyStorePasswordFile() == null ? null
                : firstLine(settings.keyStorePasswordFile(), "--key-store-password-file");
        Files.writeString(filled, fill(settings.configFile(), settings.placeholders(clusterPassword, keyStorePassword)));
        BrokerNode node = new BrokerNode(settings);
        node.server.setConfigResourcePath(filled.toUri().toString());
        node.server.setSecurityManager(new ActiveMQJAASSecurityManager(InVMLoginModule.class.getName(),
                node.securityConfiguration(clusterPassword)));
        node.server.start();
        node.server.getActiveMQServer().registerBrokerPlugin(node.counters);
        LOG.info("broker node {} listening on {} (cluster port {}, peers {}, {})", settings.nodeName(),
                settings.mqttUri(), settings.clusterPort(), settings.peers(),
                settings.insecure() ? "no login" : "login required");
        if (!settings.tls() && !org.loopstand.protocol.security.AuthPolicy.isLoopback(settings.host())) {
            LOG.warn("broker node {}: plain MQTT on {}: passwords and commands cross the network in the clear, and"
                    + " the rig's processes refuse a tcp:// broker off loopback; give --key-store for TLS",
                    settings.nodeName(), settings.host());
        }
        return node;
    }

    private SecurityConfiguration securityConfiguration(String clusterPassword) throws IOException {
        SecurityConfiguration sc = new SecurityConfiguration();
        sc.addUser(BrokerNodeSettings.CLUSTER_USER, clusterPassword);
        sc.addRole(BrokerNodeSettings.CLUSTER_USER, ROLE);
        if (settings.usersFile() != null) {
            for (Map.Entry<String, char[]> u : LinkSecurity.readUsersFile(settings.usersFile()).entrySet()) {
                sc.addUser(u.getKey(), new String(u.getValue()));
                sc.addRole(u.getKey(), ROLE);
            }
        }
        return sc;
    }

    /**
     * @return the broker file with every ${name} replaced
     * @throws IllegalArgumentException naming file:line of a placeholder that has no value
     */
    static String fill(Path template, Map<String, String> values) throws IOException {
        List<String> lines = Files.readAllLines(template, StandardCharsets.UTF_8);
        StringBuilder out = new StringBuilder();
        for (int i = 0; i < lines.size(); i++) {
            Matcher m = PLACEHOLDER.matcher(lines.get(i));
            StringBuilder line = new StringBuilder();
            while (m.find()) {
                String v = values.get(m.group(1));
                if (v == null) {
                    throw new IllegalArgumentException(template + ":" + (i + 1) + ": placeholder ${" + m.group(1)
                            + "} has no value (known: " + values.keySet() + ")");
                }
                m.appendReplacement(line, Matcher.quoteReplacement(xmlEscape(v)));
            }
            m.appendTail(line);
            out.append(line).append('\n');
        }
        return out.toString();
    }

    private static String xmlEscape(String v) {
        return v.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }

    private static String firstLine(Path file, String option) throws IOException {
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        String first = lines.isEmpty() ? "" : lines.get(0).strip();
        if (first.isEmpty()) {
            throw new IllegalArgumentException(option + " " + file + ":1: the first line is empty");
        }
        return first;
    }

    /**
     * Writes this node's counters now ({@link CountersSnapshot}): what its clients and peers sent it, what its
     * queues took, delivered, expired and killed, by topic family.
     */
    public void writeCounters(Path file) throws Exception {
        CountersSnapshot.write(file, server.getActiveMQServer().getNodeID().toString(),
                CountersSnapshot.read(server.getActiveMQServer(), counters));
    }

    /** @return the cluster's id of this node (a peer's bridge queue towards it is named by it) */
    public String nodeId() {
        return server.getActiveMQServer().getNodeID().toString();
    }

    public BrokerNodeSettings settings() {
        return settings;
    }

    @Override
    public void close() throws Exception {
        server.stop();
        LOG.info("broker node {} stopped", settings.nodeName());
    }
}
