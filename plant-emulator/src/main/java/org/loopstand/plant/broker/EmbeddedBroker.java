package org.loopstand.plant.broker;

import com.hivemq.embedded.EmbeddedHiveMQ;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Comparator;
import java.util.Objects;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.stream.Stream;
import org.loopstand.protocol.bus.mqtt.PacketLimits;
import org.loopstand.protocol.time.SystemTime;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * An MQTT 5 broker inside the plant process (HiveMQ Community Edition, embedded), for running the rig
 * without an installed broker. In-memory persistence, no usage statistics (it must never call outside
 * servers), queues sized for the rig; its config, data and extensions folders live in a temp dir that
 * is deleted on {@link #close()}. Start ≈ 1 s, stop ≈ 4 s (see docs/broker.md).
 */
public final class EmbeddedBroker implements AutoCloseable {
    public static final int DEFAULT_PORT = 1884;
    public static final String DEFAULT_BIND_ADDRESS = "127.0.0.1";
    /** Per-client queue while a subscriber is slow or away; HiveMQ's default of 1000 drops rig traffic. */
    public static final long MAX_QUEUE_SIZE = 100_000;
    /** Receive Maximum sent in CONNACK: QoS 1 publishes a client may have in flight (HiveMQ default 10). */
    public static final int SERVER_RECEIVE_MAXIMUM = 100;
    private static final Logger LOG = LoggerFactory.getLogger(EmbeddedBroker.class);

    private final String bindAddress;
    private final int requestedPort;
    private int port;
    private Path home;
    private EmbeddedHiveMQ hivemq;
    private BrokerAuthExtension auth;

    /**
     * @param bindAddress address to listen on, normally 127.0.0.1
     * @param port        1..65535, or 0 to pick a free port (see {@link #port()} after start)
     */
    public EmbeddedBroker(String bindAddress, int port) {
        this.bindAddress = Objects.requireNonNull(bindAddress, "bindAddress");
        if (port < 0 || port > 65_535) {
            throw new IllegalArgumentException("port must be in 0..65535 (0 = any free port), got " + port);
        }
        this.requestedPort = port;
    }

    /**
     * Turns broker auth on for the next start: users and topic rules from the extension; without it
     * the broker accepts anonymous clients (the loopback demo).
     */
    public synchronized EmbeddedBroker withAuth(BrokerAuthExtension extension) {
        if (hivemq != null) {
            throw new IllegalStateException("set auth before start()");
        }
        this.auth = Objects.requireNonNull(extension, "extension");
        return this;
    }

    /** @return whether clients must authenticate */
    public synchronized boolean authEnabled() {
        return auth != null;
    }

    /** A broker on 127.0.0.1:1884. */
    public EmbeddedBroker() {
        this(DEFAULT_BIND_ADDRESS, DEFAULT_PORT);
    }

    /**
     * Starts and waits until the listener is up.
     *
     * @throws IllegalStateException when the port is taken, the broker fails or does not start in time
     */
    public synchronized EmbeddedBroker start(Duration timeout) {
        if (hivemq != null) {
            throw new IllegalStateException("embedded broker already started on port " + port);
        }
        port = requestedPort == 0 ? freePort() : requestedPort;
        checkPortFree();
        long startNanos = SystemTime.wallMonotonicNanos();
        try {
            home = Files.createTempDirectory("loopstand-hivemq-");
            Path config = Files.createDirectories(home.resolve("conf"));
            Path data = Files.createDirectories(home.resolve("data"));
            Path extensions = Files.createDirectories(home.resolve("extensions"));
            Files.writeString(config.resolve("config.xml"), configXml());
            var builder = EmbeddedHiveMQ.builder().withConfigurationFolder(config).withDataFolder(data)
                    .withExtensionsFolder(extensions).withoutLoggingBootstrap();
            if (auth != null) {
                builder.withEmbeddedExtension(auth.embedded());
            }
            hivemq = builder.build();
            hivemq.start().get(timeout.toMillis(), TimeUnit.MILLISECONDS);
        } catch (IOException e) {
            cleanUp();
            throw new UncheckedIOException("cannot prepare the embedded broker's folders", e);
        } catch (TimeoutException e) {
            cleanUp();
            throw new IllegalStateException("embedded broker did not start within " + timeout.toMillis() + " ms", e);
        } catch (ExecutionException e) {
            cleanUp();
            throw new IllegalStateException("embedded broker failed to start on " + bindAddress + ":" + port + ": "
                    + e.getCause(), e.getCause());
        } catch (InterruptedException e) {
            cleanUp();
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while starting the embedded broker", e);
        }
        LOG.info("embedded broker listening on {}{} (started in {} ms)", serverUri(), auth != null ? " with auth" : "",
                (SystemTime.wallMonotonicNanos() - startNanos) / 1_000_000);
        return this;
    }

    /** @return the port listened on (the picked one when constructed with 0) */
    public synchronized int port() {
        return port;
    }

    public synchronized String serverUri() {
        return "tcp://" + bindAddress + ":" + port;
    }

    public synchronized boolean isRunning() {
        return hivemq != null;
    }

    /** Stops the broker (waits at most 15 s) and deletes its temp dir. */
    @Override
    public synchronized void close() {
        if (hivemq == null) {
            return;
        }
        long stopNanos = SystemTime.wallMonotonicNanos();
        try {
            hivemq.stop().get(15, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } catch (ExecutionException | TimeoutException e) {
            LOG.warn("embedded broker did not stop cleanly: {}", e.toString());
        }
        cleanUp();
        LOG.info("embedded broker on port {} stopped in {} ms", port, (SystemTime.wallMonotonicNanos() - stopNanos) / 1_000_000);
    }

    private void cleanUp() {
        if (hivemq != null) {
            try {
                hivemq.close();
            } catch (ExecutionException | InterruptedException | RuntimeException e) {
                LOG.debug("closing embedded broker: {}", e.toString());
            }
            hivemq = null;
        }
        if (home != null) {
            // Twice: HiveMQ's own shutdown hook may still write a file while the first pass runs.
            for (int pass = 0; pass < 2 && Files.exists(home); pass++) {
                try (Stream<Path> files = Files.walk(home)) {
                    files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
                } catch (IOException | UncheckedIOException e) {
                    LOG.debug("deleting {}: {}", home, e.toString());
                }
            }
            if (Files.exists(home)) {
                LOG.warn("could not delete the embedded broker's temp dir {}", home);
            }
            home = null;
        }
    }

    private void checkPortFree() {
        try (ServerSocket probe = new ServerSocket()) {
            probe.bind(new InetSocketAddress(InetAddress.getByName(bindAddress), port));
        } catch (IOException e) {
            throw new IllegalStateException("port " + port + " on " + bindAddress + " is already in use: "
                    + e.getMessage(), e);
        }
    }

    private int freePort() {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getByName(bindAddress))) {
            return s.getLocalPort();
        } catch (IOException e) {
            throw new UncheckedIOException("no free port on " + bindAddress, e);
        }
    }

    private String configXml() {
        return """
                <?xml version="1.0"?>
                <hivemq>
                    <listeners>
                        <tcp-listener>
                            <port>%d</port>
                            <bind-address>%s</bind-address>
                        </tcp-listener>
                    </listeners>
                    <mqtt>
                        <packets>
                            <max-packet-size>%d</max-packet-size>
                        </packets>
                        <queued-messages>
                            <max-queue-size>%d</max-queue-size>
                            <strategy>discard</strategy>
                        </queued-messages>
                        <receive-maximum>
                            <server-receive-maximum>%d</server-receive-maximum>
                        </receive-maximum>
                    </mqtt>
                    <persistence>
                        <mode>in-memory</mode>
                    </persistence>
                    <anonymous-usage-statistics>
                        <enabled>false</enabled>
                    </anonymous-usage-statistics>
                </hivemq>
                """.formatted(port, bindAddress, PacketLimits.MAX_PACKET_BYTES, MAX_QUEUE_SIZE, SERVER_RECEIVE_MAXIMUM);
    }
}
