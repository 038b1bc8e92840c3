package org.loopstand.protocol.bus.mqtt;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.testing.MosquittoProcess;
import org.loopstand.protocol.time.WallClock;

/** Link behaviour that needs a broker of its own to stop, restart or freeze. */
class MqttLinkPrivateBrokerTest {
    @TempDir
    Path dir;
    private MosquittoProcess broker;
    private final List<MqttLink> links = new ArrayList<>();

    @AfterEach
    void tearDown() {
        links.forEach(MqttLink::close);
        if (broker != null) {
            broker.close();
        }
    }

    private MqttLink started(String clientId) throws InterruptedException {
        MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(broker.serverUri()).clientId(clientId)
                .reconnectBackoff(100, 500, 0.2).build(), WallClock.INSTANCE);
        links.add(link);
        link.start();
        assertThat(link.awaitConnected(10_000)).isTrue();
        return link;
    }

    @Test
    void shouldResubscribeAndReceiveAgainAfterBrokerRestart() throws Exception {
        broker = MosquittoProcess.start(dir); // persistence false: the restarted broker forgets all sessions
        MqttLink sub = started("restart-sub");
        Inbox inbox = new Inbox();
        sub.subscribe("rig/area/+/ace", Qos.AT_LEAST_ONCE, inbox);
        MqttLink pub = started("restart-pub");
        pub.publish(OutboundMessage.of("rig/area/a/ace", "before".getBytes(UTF_8), Qos.AT_LEAST_ONCE)).get();
        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 1);

        broker.kill();
        await().atMost(Duration.ofSeconds(5)).until(() -> !sub.isConnected() && !pub.isConnected());
        broker.restart();
        await().atMost(Duration.ofSeconds(15)).until(() -> sub.isConnected() && pub.isConnected());
        pub.publish(OutboundMessage.of("rig/area/a/ace", "after".getBytes(UTF_8), Qos.AT_LEAST_ONCE)).get();

        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 2);
        assertThat(inbox.payloads()).containsExactly("before", "after");
        assertThat(sub.counters().reconnects()).isEqualTo(1);
    }

    @Test
    void shouldRefusePublishWithBackPressureWhenReceiveMaximumIsReached() throws Exception {
        // Mosquitto sends max_inflight_messages as Receive Maximum in the CONNACK (MQTT 5 §3.2.2.3.3).
        broker = MosquittoProcess.start(dir, List.of("max_inflight_messages 2"));
        MqttLink pub = started("bp-pub");
        assertThat(pub.inflightLimit()).isEqualTo(2);

        broker.pause(); // SIGSTOP: no PUBACK comes back, so both permits stay taken
        CompletableFuture<Void> first = pub.publish(OutboundMessage.of("rig/cmd/u1", new byte[] {1}, Qos.AT_LEAST_ONCE));
        CompletableFuture<Void> second = pub.publish(OutboundMessage.of("rig/cmd/u1", new byte[] {2}, Qos.AT_LEAST_ONCE));
        CompletableFuture<Void> third = pub.publish(OutboundMessage.of("rig/cmd/u1", new byte[] {3}, Qos.AT_LEAST_ONCE));

        assertThat(third).isCompletedExceptionally();
        assertThat(reasonOf(third)).isEqualTo(BusException.Reason.BACK_PRESSURE);
        assertThat(pub.failures(BusException.Reason.BACK_PRESSURE)).isEqualTo(1);
        assertThat(pub.counters().sendFailed()).isEqualTo(1);

        broker.resume();
        CompletableFuture.allOf(first, second).get(10, java.util.concurrent.TimeUnit.SECONDS);
        assertThat(pub.counters().sent()).isEqualTo(2);
        pub.publish(OutboundMessage.of("rig/cmd/u1", new byte[] {4}, Qos.AT_LEAST_ONCE))
                .get(10, java.util.concurrent.TimeUnit.SECONDS);
    }

    private static BusException.Reason reasonOf(CompletableFuture<Void> f) {
        try {
            f.get();
            throw new AssertionError("expected a failed future");
        } catch (ExecutionException e) {
            return ((BusException) e.getCause()).reason();
        } catch (InterruptedException e) {
            throw new AssertionError(e);
        }
    }
}
