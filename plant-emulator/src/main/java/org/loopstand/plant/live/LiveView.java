package org.loopstand.plant.live;

import java.io.IOException;
import java.net.InetAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.protocol.time.Clock;

/**
 * The live view of one plant process: a {@link LiveSampler} on the plant thread feeding a
 * {@link LiveFeed}, a {@link LiveBusTap} on the plant connection, and the {@link LiveServer}.
 */
public final class LiveView implements AutoCloseable {
    /** Wall ms between two snapshots. */
    public static final long SAMPLE_PERIOD_MS = 250;
    /** Snapshots kept for a browser that opens the page late (10 wall minutes). */
    public static final int KEPT_SNAPSHOTS = 2400;

    /**
     * Where and how the page is served.
     *
     * @param bind      address to listen on; off loopback only with a token
     * @param port      TCP port, 0 = any free port, 1 – 65535
     * @param tokenFile file whose first line is the token every request must carry, or null
     * @param controls  true: offer fault controls (embedded or declared test broker only)
     */
    public record Settings(String bind, int port, Path tokenFile, boolean controls) {
        /** @return the token, or null; @throws IllegalArgumentException naming what is wrong */
        public String check() {
            if (port < 0 || port > 65_535) {
                throw new IllegalArgumentException("--live-port must be in [0, 65535], got " + port);
            }
            String token = null;
            if (tokenFile != null) {
                try {
                    List<String> lines = Files.readAllLines(tokenFile, StandardCharsets.UTF_8);
                    token = lines.isEmpty() ? "" : lines.get(0).trim();
                } catch (IOException e) {
                    throw new IllegalArgumentException("--live-token-file " + tokenFile + " cannot be read: " + e.getMessage());
                }
                if (token.length() < 16) {
                    throw new IllegalArgumentException("--live-token-file " + tokenFile
                            + ": the token (first line) must have at least 16 characters, got " + token.length());
                }
            }
            boolean loopback;
            try {
                loopback = InetAddress.getByName(bind).isLoopbackAddress();
            } catch (IOException e) {
                throw new IllegalArgumentException("--live-bind " + bind + " is not an address here: " + e.getMessage());
            }
            if (!loopback && token == null) {
                throw new IllegalArgumentException("--live-bind " + bind + " is off loopback: give --live-token-file FILE"
                        + " so that every request must carry the token");
            }
            return token;
        }
    }

    private final LiveSampler sampler;
    private final LiveServer server;
    private final String address;

    private LiveView(LiveSampler sampler, LiveServer server, String address) {
        this.sampler = sampler;
        this.server = server;
        this.address = address;
    }

    /**
     * Wires the live view into a built plant (before {@code runner.start()}) and starts serving.
     *
     * @param scenarioClock the plant's injected clock
     * @param wall          paces the snapshots
     * @param checkNames    the scenario's checks
     * @param report        where the report will be (run folder/report.html), or null
     */
    public static LiveView start(Settings settings, PlantRunner runner, FaultHooks hooks, Clock scenarioClock, Clock wall,
                                 List<String> checkNames, Path report) throws IOException {
        String token = settings.check();
        LiveFeed feed = new LiveFeed(KEPT_SNAPSHOTS);
        LiveBusTap tap = new LiveBusTap(scenarioClock).subscribe(runner.plantBus(), runner.topics());
        LiveSampler sampler = new LiveSampler(feed, tap, runner.counters(), runner.lateness(), wall, scenarioClock,
                SAMPLE_PERIOD_MS, checkNames);
        runner.agent().sampleWith(sampler);
        LiveFaultDesk desk = settings.controls() ? new LiveFaultDesk(runner.agent(), hooks, scenarioClock) : null;
        PlantMetricsPage metrics = new PlantMetricsPage(runner.counters(), runner.lateness(), feed, desk);
        LiveServer server = new LiveServer(settings.bind(), settings.port(), token, runner.topics().site(), feed, desk,
                metrics, report);
        String host = settings.bind().contains(":") ? "[" + settings.bind() + "]" : settings.bind();
        return new LiveView(sampler, server, "http://" + host + ":" + server.port() + "/");
    }

    /** @return the page's address, e.g. {@code http://127.0.0.1:8080/} */
    public String address() {
        return address;
    }

    /** Plant thread: a scenario check was decided (its line as told to the terminal). */
    public void checkDecided(String line) {
        sampler.checkDecided(line);
    }

    @Override
    public void close() {
        server.close();
    }
}
