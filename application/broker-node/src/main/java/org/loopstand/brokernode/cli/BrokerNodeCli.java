package org.loopstand.brokernode.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import org.loopstand.brokernode.BrokerNode;
import org.loopstand.brokernode.BrokerNodeSettings;
import org.loopstand.protocol.security.AuthPolicy;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code loopstand broker-node}: runs one node of the clustered MQTT 5 broker until stopped. */
@Command(name = "broker-node", mixinStandardHelpOptions = true,
        description = {"Run one node of the three-node MQTT 5 broker cluster (Apache ActiveMQ Artemis) until"
                + " Ctrl-C or SIGTERM. See docs/broker.md and docs/deployment.md.",
                "Off loopback it needs --users and --cluster-password-file."})
public final class BrokerNodeCli implements Callable<Integer> {
    @Option(names = "--name", required = true, description = "unique node name, e.g. n1")
    String name;

    @Option(names = "--host", defaultValue = "127.0.0.1", description = "address to listen on (default ${DEFAULT-VALUE})")
    String host;

    @Option(names = "--mqtt-port", defaultValue = "1883", description = "MQTT port (default ${DEFAULT-VALUE})")
    int mqttPort;

    @Option(names = "--cluster-port", defaultValue = "61616", description = "node-to-node port (default ${DEFAULT-VALUE})")
    int clusterPort;

    @Option(names = "--peer", description = "host:cluster-port of another node; give it twice")
    List<String> peers = new ArrayList<>();

    @Option(names = "--config", defaultValue = "${env:LOOPSTAND_HOME:-.}/config/broker/artemis/broker-node.xml",
            description = "broker file with placeholders (default ${DEFAULT-VALUE})")
    Path config;

    @Option(names = "--users", description = "MQTT users file, 'username = password' a line (format of"
            + " config/broker/users.example.properties)")
    Path users;

    @Option(names = "--cluster-password-file", description = "first line: the password nodes log in to each other"
            + " with, the same on every node")
    Path clusterPasswordFile;

    @Option(names = "--key-store", description = "PKCS#12 (.p12) or JKS key store with this node's certificate and key:"
            + " the MQTT listener speaks TLS (clients use ssl://)")
    Path keyStore;

    @Option(names = "--key-store-password-file", description = "first line: the key store's password")
    Path keyStorePasswordFile;

    @Option(names = "--work-dir", description = "where the filled-in broker file goes, readable by its owner only"
            + " (default: loopstand-broker-node in the system temp folder)")
    Path workDir = Path.of(System.getProperty("java.io.tmpdir"), "loopstand-broker-node");

    @Option(names = "--counters-dir", description = "on a line 'counters LABEL' on standard input, write this node's"
            + " message counters to DIR/counters-NAME-LABEL.properties (by topic family: received from clients and peers,"
            + " queued, delivered, expired, killed; docs/broker.md) and print 'counters LABEL written'")
    Path countersDir;

    public static void main(String[] args) {
        System.exit(new CommandLine(new BrokerNodeCli()).execute(withoutCommandName(args)));
    }

    /** @return the arguments without a leading "broker-node" (the launcher passes the subcommand's name on) */
    static String[] withoutCommandName(String[] args) {
        return args.length > 0 && args[0].equals("broker-node") ? Arrays.copyOfRange(args, 1, args.length) : args;
    }

    @Override
    public Integer call() throws Exception {
        BrokerNodeSettings s = new BrokerNodeSettings(name, host, mqttPort, clusterPort, peers, config, users,
                clusterPasswordFile, keyStore, keyStorePasswordFile);
        List<String> problems = s.check();
        if (!problems.isEmpty()) {
            System.err.println("broker-node: refusing to start: " + String.join("; ", problems));
            return 2;
        }
        if (s.insecure()) {
            System.err.println(AuthPolicy.INSECURE_BANNER);
        }
        BrokerNode node;
        try {
            node = BrokerNode.start(s, workDir);
        } catch (IllegalArgumentException e) {
            System.err.println("broker-node: " + e.getMessage());
            return 2;
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            try {
                node.close();
            } catch (Exception e) {
                System.err.println("broker-node: stop failed: " + e);
            }
            stopped.countDown();
        }, "broker-node-shutdown"));
        System.out.println("broker node " + name + " listening on " + s.mqttUri() + " (cluster port " + clusterPort
                + ", peers " + peers + ", node id " + node.nodeId() + ")");
        System.out.flush();
        if (countersDir != null) {
            CountersOrders.start(node, countersDir, name);
        }
        stopped.await();
        return 0;
    }
}
