package org.loopstand.bench.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;

/** What every connection the bench opens shares: its one MQTT login and, on the cluster, its time limits. */
final class BenchLinks {
    /**
     * Connect and SUBACK wait on the cluster (layout hosts), ms: a node makes a queue per subscription and tells
     * its peers, so a connection that subscribes a thousand units' topics at once can take longer than the
     * links' 5 s default on a loaded machine (seen at 1,000 units: every attempt timed out, on every node).
     */
    static final int CLUSTER_TIMEOUT_MS = 120_000;

    private BenchLinks() {
    }

    /** @return how long to wait for a connection, ms: the given time, or five minutes on the cluster */
    static long connectWaitMs(BenchSettings s, long elsewhereMs) {
        return s.layout() == BenchSettings.Layout.HOSTS ? 300_000 : elsewhereMs;
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
