package org.loopstand.plant.runtime;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.WallClock;

/** The demo site under a site id of its own, so tests sharing a broker do not see each other. */
final class TestSite {
    static final Path DEMO = Path.of("..", "config", "sites", "demo-site.yaml");
    private static final AtomicInteger COUNTER = new AtomicInteger();

    private TestSite() {
    }

    /** Writes the demo site with a unique id into {@code dir}; @return the file */
    static Path write(Path dir) {
        try {
            String id = "t" + ProcessHandle.current().pid() + "-" + COUNTER.incrementAndGet();
            String text = Files.readString(DEMO).replace("siteId: demo-site", "siteId: " + id);
            Path file = dir.resolve(id + ".yaml");
            Files.writeString(file, text);
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static Grid load(Path file) {
        try {
            return SiteLoader.load(file);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static LinkFactory mqtt(String uri) {
        return (clientId, will) -> {
            MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(uri).clientId(clientId)
                    .reconnectBackoff(100, 1_000, 0.2);
            if (will != null) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            return new MqttLink(b.build(), WallClock.INSTANCE).start();
        };
    }

    static MqttLink client(String uri, String clientId) throws InterruptedException {
        MqttLink link = (MqttLink) mqtt(uri).connect(clientId, null);
        if (!link.awaitConnected(10_000)) {
            throw new AssertionError("test client did not connect to " + uri);
        }
        return link;
    }

    /** Clears retained topics a test left on a shared broker. */
    static void clearRetained(MessageBus bus, List<String> topics) {
        for (String t : topics) {
            try {
                bus.publish(new OutboundMessage(t, new byte[0], Qos.AT_LEAST_ONCE, true, 0)).get(5, TimeUnit.SECONDS);
            } catch (Exception e) {
                // best effort
            }
        }
    }
}
