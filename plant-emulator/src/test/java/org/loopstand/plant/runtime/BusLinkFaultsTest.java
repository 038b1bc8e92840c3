package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.broker.SharedEmbeddedBroker;
import org.loopstand.protocol.bus.ConnectionListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.bus.memory.InMemoryBus;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.time.WallClock;

/**
 * Connection faults on real connections: the last will fires on an abrupt cut and not on a clean one
 * (MQTT 5 §3.1.2.5: the will is published when the network connection closes without a DISCONNECT
 * with reason 0x00, from memory), and a refused reconnect keeps the link down for the stated time on
 * the plant clock, then lets it come back.
 */
class BusLinkFaultsTest {
    private static final String WILL = "loopstand/v1/test-site/unit/u1/link";

    private static MqttLink link(String id, boolean will) throws Exception {
        MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(SharedEmbeddedBroker.serverUri()).clientId(id)
                .reconnectBackoff(100, 200, 0.0);
        if (will) {
            b.lastWill(WILL + "/" + id, "offline".getBytes(StandardCharsets.UTF_8), Qos.AT_LEAST_ONCE, false);
        }
        MqttLink l = new MqttLink(b.build(), WallClock.INSTANCE).start();
        assertThat(l.awaitConnected(10_000)).isTrue();
        return l;
    }

    @Test
    void shouldFireTheWillOnAnAbruptCutAndHoldTheMqttLinkDownUntilTheRefusalEnds() throws Exception {
        String id = "blf-abrupt-" + System.identityHashCode(this);
        List<String> wills = new CopyOnWriteArrayList<>();
        VirtualClock plantClock = new VirtualClock(1_767_225_600_000L);
        try (MqttLink watcher = link(id + "-w", false); MqttLink unit = link(id, true)) {
            watcher.subscribe(WILL + "/" + id, Qos.AT_LEAST_ONCE, m -> wills.add(new String(m.payload(), StandardCharsets.UTF_8)));
            BusLinkFaults faults = BusLinkFaults.forBus(unit, plantClock);
            faults.disconnectAbruptly();
            faults.refuseReconnectForS(30);
            await().atMost(Duration.ofSeconds(10)).until(() -> wills.contains("offline"));
            assertThat(unit.isConnected()).isFalse();
            // reconnect backoff is 100 ms: a second of wall time would have seen several attempts, none made
            await().pollDelay(Duration.ofSeconds(1)).atMost(Duration.ofSeconds(2)).until(() -> true);
            plantClock.advanceMillis(29_900);
            assertThat(faults.poll()).isZero();
            assertThat(unit.isConnected()).isFalse();
            assertThat(unit.counters().reconnects()).isZero();
            plantClock.advanceMillis(100);
            assertThat(faults.poll()).isEqualTo(1);
            await().atMost(Duration.ofSeconds(10)).until(unit::isConnected);
            assertThat(unit.counters().reconnects()).isEqualTo(1);
        }
    }

    @Test
    void shouldNotFireTheWillOnACleanDisconnectAndComeBackAtOnceWhenAllowed() throws Exception {
        String id = "blf-clean-" + System.identityHashCode(this);
        List<String> wills = new CopyOnWriteArrayList<>();
        List<Boolean> downs = new CopyOnWriteArrayList<>();
        VirtualClock plantClock = new VirtualClock(1_767_225_600_000L);
        try (MqttLink watcher = link(id + "-w", false); MqttLink unit = link(id, true)) {
            watcher.subscribe(WILL + "/" + id, Qos.AT_LEAST_ONCE, m -> wills.add(new String(m.payload(), StandardCharsets.UTF_8)));
            unit.addConnectionListener(new ConnectionListener() {
                @Override
                public void onConnected(boolean reconnect) {
                }

                @Override
                public void onDisconnected(Throwable cause) {
                    downs.add(true);
                }
            });
            BusLinkFaults faults = BusLinkFaults.forBus(unit, plantClock);
            faults.disconnectCleanly();
            faults.refuseReconnectForS(Double.POSITIVE_INFINITY);
            await().atMost(Duration.ofSeconds(10)).until(() -> !downs.isEmpty());
            plantClock.advanceMillis(3_600_000);
            assertThat(faults.poll()).isZero(); // refused until told
            faults.refuseReconnectForS(0);
            await().atMost(Duration.ofSeconds(10)).until(unit::isConnected);
            // a will the broker had published would have reached the watcher long before the reconnect
            watcher.publish(OutboundMessage.of(WILL + "/" + id, "marker".getBytes(StandardCharsets.UTF_8), Qos.AT_LEAST_ONCE)).get();
            await().atMost(Duration.ofSeconds(10)).until(() -> wills.contains("marker"));
            assertThat(wills).containsExactly("marker");
            assertThat(downs).hasSize(1);
        }
    }

    @Test
    void shouldDropTheInMemoryConnectionWithItsWillAndReconnectWithItsSubscriptionsWhenTheRefusalEnds() {
        VirtualClock clock = new VirtualClock(1_767_225_600_000L);
        InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);
        InMemoryBus watcher = broker.connect("watcher");
        List<String> seen = new CopyOnWriteArrayList<>();
        watcher.subscribe(WILL, Qos.AT_LEAST_ONCE, m -> seen.add(new String(m.payload(), StandardCharsets.UTF_8)));
        InMemoryBus unit = broker.connect("u1", new OutboundMessage(WILL, "offline".getBytes(StandardCharsets.UTF_8),
                Qos.AT_LEAST_ONCE, true, 0));
        List<String> unitGot = new CopyOnWriteArrayList<>();
        unit.subscribe("loopstand/v1/test-site/controller/+/status", Qos.AT_LEAST_ONCE,
                m -> unitGot.add(new String(m.payload(), StandardCharsets.UTF_8)));
        BusLinkFaults faults = BusLinkFaults.forBus(unit, clock);

        faults.disconnectAbruptly();
        faults.refuseReconnectForS(60);
        assertThat(seen).containsExactly("offline");
        assertThat(unit.isConnected()).isFalse();
        watcher.publish(new OutboundMessage("loopstand/v1/test-site/controller/c1/status",
                "regulating".getBytes(StandardCharsets.UTF_8), Qos.AT_LEAST_ONCE, true, 0));
        clock.advanceMillis(59_999);
        assertThat(faults.poll()).isZero();
        assertThat(unit.isConnected()).isFalse();
        assertThat(unitGot).isEmpty(); // nothing reaches a dropped connection
        clock.advanceMillis(1);
        assertThat(faults.poll()).isEqualTo(1);
        assertThat(unit.isConnected()).isTrue();
        assertThat(unitGot).containsExactly("regulating"); // the retained status, delivered on resubscribe
        assertThat(unit.counters().reconnects()).isEqualTo(1);

        faults.disconnectCleanly();
        faults.refuseReconnectForS(0);
        assertThat(seen).containsExactly("offline"); // a clean disconnect leaves no will
        assertThat(unit.isConnected()).isTrue();
    }
}
