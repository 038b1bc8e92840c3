package org.loopstand.plant.broker;

import java.time.Duration;

/**
 * One embedded broker per test JVM (its ≈ 4 s stop makes one per test class too slow): started on a
 * free loopback port on first use, stopped by a shutdown hook. Tests isolate by unique topic prefix.
 */
public final class SharedEmbeddedBroker {
    private static EmbeddedBroker broker;

    private SharedEmbeddedBroker() {
    }

    /** @return tcp://127.0.0.1:port of the shared broker, starting it if needed */
    public static synchronized String serverUri() {
        if (broker == null) {
            EmbeddedBroker b = new EmbeddedBroker("127.0.0.1", 0).start(Duration.ofSeconds(30));
            Runtime.getRuntime().addShutdownHook(new Thread(b::close, "shared-broker-stop"));
            broker = b;
        }
        return broker.serverUri();
    }
}
