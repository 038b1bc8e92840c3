package org.loopstand.bench.broker;

import java.io.IOException;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.OptionalLong;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.LockSupport;
import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.protocol.time.WallClock;

/**
 * The broker a bench run uses: the embedded HiveMQ CE in this JVM, a Mosquitto the harness starts on a
 * free loopback port from {@code config/broker/mosquitto-bench.conf} (never the system one on 1883),
 * or a broker given by URL.
 */
public final class BenchBroker implements AutoCloseable {
    private final String kind;
    private final String serverUri;
    private final EmbeddedBroker embedded;
    private final Process mosquitto;

    private BenchBroker(String kind, String serverUri, EmbeddedBroker embedded, Process mosquitto) {
        this.kind = kind;
        this.serverUri = serverUri;
        this.embedded = embedded;
        this.mosquitto = mosquitto;
    }

    /** @param spec {@code embedded}, {@code mosquitto}, or a tcp:// URL */
    public static BenchBroker start(String spec, Path configFile, Path runDir) throws IOException, InterruptedException {
        if ("embedded".equals(spec)) {
            EmbeddedBroker b = new EmbeddedBroker(EmbeddedBroker.DEFAULT_BIND_ADDRESS, 0);
            b.start(Duration.ofSeconds(30));
            return new BenchBroker("embedded HiveMQ CE", b.serverUri(), b, null);
        }
        if ("mosquitto".equals(spec)) {
            int port = freePort();
            String conf = Files.readString(configFile, StandardCharsets.UTF_8)
                    .replaceAll("(?m)^listener \\d+ 127\\.0\\.0\\.1$", "listener " + port + " 127.0.0.1");
            if (!conf.contains("listener " + port + " 127.0.0.1")) {
                throw new IllegalArgumentException(configFile + " has no line 'listener PORT 127.0.0.1' to put the port on");
            }
            Path copy = runDir.resolve("mosquitto.conf");
            Files.writeString(copy, conf, StandardCharsets.UTF_8);
            Process p = new ProcessBuilder("/usr/sbin/mosquitto", "-c", copy.toString())
                    .redirectErrorStream(true).redirectOutput(runDir.resolve("mosquitto.log").toFile()).start();
            waitForPort(port, p);
            return new BenchBroker("Mosquitto (own, " + copy.getFileName() + ")", "tcp://127.0.0.1:" + port, null, p);
        }
        if (spec.startsWith("tcp://")) {
            return new BenchBroker("given " + spec, spec, null, null);
        }
        throw new IllegalArgumentException("--broker must be embedded, mosquitto or a tcp:// URL, got " + spec);
    }

    private static int freePort() throws IOException {
        try (ServerSocket s = new ServerSocket()) {
            s.bind(new InetSocketAddress("127.0.0.1", 0));
            return s.getLocalPort();
        }
    }

    private static void waitForPort(int port, Process p) throws IOException {
        long deadline = WallClock.INSTANCE.monotonicNanos() + TimeUnit.SECONDS.toNanos(10);
        while (WallClock.INSTANCE.monotonicNanos() < deadline) {
            if (!p.isAlive()) {
                throw new IOException("mosquitto exited at start (code " + p.exitValue() + "), see mosquitto.log");
            }
            try (Socket s = new Socket()) {
                s.connect(new InetSocketAddress("127.0.0.1", port), 200);
                return;
            } catch (IOException e) {
                LockSupport.parkNanos(50_000_000L);
            }
        }
        p.destroy();
        throw new IOException("mosquitto did not listen on 127.0.0.1:" + port + " within 10 s");
    }

    public String serverUri() {
        return serverUri;
    }

    public String kind() {
        return kind;
    }

    /** @return the broker's own process id when it runs outside this JVM and was started here */
    public OptionalLong pid() {
        return mosquitto == null ? OptionalLong.empty() : OptionalLong.of(mosquitto.pid());
    }

    @Override
    public void close() {
        if (embedded != null) {
            embedded.close();
        }
        if (mosquitto != null) {
            mosquitto.destroy();
            try {
                if (!mosquitto.waitFor(5, TimeUnit.SECONDS)) {
                    mosquitto.destroyForcibly();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
