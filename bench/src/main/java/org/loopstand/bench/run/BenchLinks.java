package org.loopstand.bench.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.util.List;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;

/** What every connection the bench opens shares: its one MQTT login and, on the cluster, its time limits. */
final class BenchLinks {
    /**
     * Connect and SUBACK wait on the cluster (layout hosts), ms: a node makes a queue per subscription and tells
     * its peers, so a connection that subscribes hundreds of units' topics at once takes far longer than the
     * links' 5 s default on a loaded machine (seen: 1,000 units timed out at 5 s; 3,000 at 120 s, on every node,
     * each attempt starting over on the next node; about 25 queues a second per node at load 45).
     */
    static final int CLUSTER_TIMEOUT_MS = 900_000;

    private BenchLinks() {
    }

    /**
     * Starts the links (the first connect subscribes all they were given) and waits for each.
     *
     * @throws IllegalStateException naming the first link not connected within the wait
     */
    static void startAndAwait(List<MqttLink> links, long waitMs, String role)
            throws InterruptedException {
        links.forEach(MqttLink::start);
        for (var l : links) {
            if (!l.awaitConnected(waitMs)) {
                throw new IllegalStateException(role + " link " + l.clientId() + " did not connect within " + waitMs + " ms");
            }
        }
    }

    /** @return how long to wait for a connection, ms: the given time, or {@link #CLUSTER_TIMEOUT_MS} on the cluster */
    static long connectWaitMs(BenchSettings s, long elsewhereMs) {
        return s.layout() == BenchSettings.Layout.HOSTS ? CLUSTER_TIMEOUT_MS : elsewhereMs;
    }

    /** @return the builder, with the bench's login when the settings name a user, and the cluster's time limits */
    static MqttLinkConfig.Builder configure(MqttLinkConfig.Builder b, BenchSettings s) {
        if (s.layout() == BenchSettings.Layout.HOSTS) {
            b.connectTimeoutMs(CLUSTER_TIMEOUT_MS).operationTimeoutMs(CLUSTER_TIMEOUT_MS);
        }
        if (s.brokerUser().isEmpty()) {
            return b;
        }
        try {
            String password = Files.readAllLines(s.outDir().resolve(BenchSettings.BROKER_PASSWORD_FILE),
                    StandardCharsets.UTF_8).get(0).strip();
            return b.credentials(s.brokerUser(), password.toCharArray());
        } catch (IOException e) {
            throw new UncheckedIOException("bench: cannot read the broker password file in " + s.outDir(), e);
        }
    }
}
