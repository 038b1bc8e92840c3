package org.loopstand.protocol.bus.mqtt;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.io.IOException;
import java.io.InputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.testing.MosquittoProcess;
import org.loopstand.protocol.time.WallClock;

/**
 * Failover between broker nodes, on two private Mosquitto instances on free loopback ports standing in
 * for two nodes of a cluster (they do not bridge: a message reaches the subscribers of its own node).
 */
class MqttLinkFailoverTest {
    @TempDir
    Path dir;
    private final List<AutoCloseable> closeLast = new ArrayList<>();
    private final List<MqttLink> links = new ArrayList<>();

    @AfterEach
    void tearDown() throws Exception {
        links.forEach(MqttLink::close);
        for (AutoCloseable c : closeLast) {
            c.close();
        }
    }

    private MosquittoProcess node(String name) {
        MosquittoProcess m = MosquittoProcess.start(dir.resolve(name).toFile().mkdirs() ? dir.resolve(name) : dir);
        closeLast.add(m);
        return m;
    }

    private MqttLink link(String clientId, String brokers) {
        MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(brokers).clientId(clientId)
                .reconnectBackoff(100, 400, 0.2).connectTimeoutMs(1000).operationTimeoutMs(2000).build(),
                WallClock.INSTANCE);
        links.add(link);
        return link;
    }

    @Test
    void shouldFailOverToTheNextNodeResubscribeAndReceiveAgainWhenTheFirstIsKilled() throws Exception {
        MosquittoProcess a = node("a");
        MosquittoProcess b = node("b");
        String list = a.serverUri() + "," + b.serverUri();
        MqttLink sub = link("fo-sub", list);
        Inbox inbox = new Inbox();
        sub.subscribe("rig/unit/+/command", Qos.AT_LEAST_ONCE, inbox);
        MqttLink pub = link("fo-pub", list);
        sub.start();
        pub.start();
        assertThat(sub.awaitConnected(10_000) && pub.awaitConnected(10_000)).isTrue();
        assertThat(sub.connectedUri()).isEqualTo(a.serverUri());
        pub.publish(OutboundMessage.of("rig/unit/u1/command", "on-a".getBytes(UTF_8), Qos.AT_LEAST_ONCE)).get();
        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 1);

        long killedNanos = WallClock.INSTANCE.monotonicNanos();
        a.kill();
        await().atMost(Duration.ofSeconds(10)).until(() -> b.serverUri().equals(sub.connectedUri())
                && b.serverUri().equals(pub.connectedUri()));
        long failoverMs = (WallClock.INSTANCE.monotonicNanos() - killedNanos) / 1_000_000;
        System.out.println("failover of two links from a killed node to the next: " + failoverMs + " ms");
        pub.publish(OutboundMessage.of("rig/unit/u1/command", "on-b".getBytes(UTF_8), Qos.AT_LEAST_ONCE)).get();

        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 2);
        assertThat(inbox.payloads()).containsExactly("on-a", "on-b");
        assertThat(sub.counters().reconnects()).isEqualTo(1);
    }

    @Test
    void shouldLeaveANodeThatAcceptsTcpButNeverSendsConnack() throws Exception {
        ServerSocket silent = new ServerSocket(0, 50, InetAddress.getLoopbackAddress());
        closeLast.add(silent);
        List<Socket> accepted = new CopyOnWriteArrayList<>();
        Thread acceptor = new Thread(() -> {
            try {
                while (true) {
                    Socket s = silent.accept(); // reads the CONNECT and never answers
                    accepted.add(s);
                    InputStream in = s.getInputStream();
                    in.readNBytes(in.available());
                }
            } catch (IOException e) {
                // closed at the end of the test
            }
        }, "silent-node");
        acceptor.setDaemon(true);
        acceptor.start();
        MosquittoProcess b = node("b");
        String silentUri = "tcp://127.0.0.1:" + silent.getLocalPort();

        MqttLink l = link("fo-silent", silentUri + "," + b.serverUri());
        l.start();

        assertThat(l.awaitConnected(10_000)).isTrue();
        assertThat(l.connectedUri()).isEqualTo(b.serverUri());
        assertThat(accepted).hasSize(1); // it was tried first, in list order, and given up after the timeout
        for (Socket s : accepted) {
            s.close();
        }
    }

    @Test
    void shouldNotSendAQos1PublishStuckOnAFrozenNodeLateToTheNextNode() throws Exception {
        MosquittoProcess a = node("a");
        MosquittoProcess b = node("b");
        MqttLink watcher = link("fo-watch", b.serverUri()); // sees everything that reaches node b
        Inbox onB = new Inbox();
        watcher.subscribe("rig/unit/+/command", Qos.AT_LEAST_ONCE, onB);
        watcher.start();
        MqttLink pub = link("fo-late-pub", a.serverUri() + "," + b.serverUri());
        pub.start();
        assertThat(watcher.awaitConnected(10_000) && pub.awaitConnected(10_000)).isTrue();

        a.pause(); // no PUBACK: the command stays in flight at the client
        CompletableFuture<Void> stuck = pub.publish(new OutboundMessage("rig/unit/u1/command",
                "stuck".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false, 1));
        a.kill();
        await().atMost(Duration.ofSeconds(10)).until(() -> b.serverUri().equals(pub.connectedUri()));
        pub.publish(OutboundMessage.of("rig/unit/u1/command", "fresh".getBytes(UTF_8), Qos.AT_LEAST_ONCE)).get();

        await().atMost(Duration.ofSeconds(5)).until(() -> onB.size() >= 1);
        assertThat(onB.payloads()).containsExactly("fresh");
        await().atMost(Duration.ofSeconds(5)).until(stuck::isDone);
        assertThat(stuck).isCompletedExceptionally();
        assertThat(pub.failures(org.loopstand.protocol.bus.BusException.Reason.NOT_CONNECTED)).isEqualTo(1);
    }
}
