package org.loopstand.protocol.bus.mqtt;

import static java.nio.charset.StandardCharsets.UTF_8;
import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.UUID;
import java.util.function.UnaryOperator;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.WallClock;

/**
 * MQTT behaviour every broker the rig uses must show through {@link MqttLink}; one subclass per broker.
 * Expected behaviour: OASIS MQTT Version 5.0, from memory (section numbers as recalled).
 * Tests isolate themselves by a unique topic prefix and client ids, and clear retained topics.
 */
public abstract class MqttLinkContract {
    private final List<MqttLink> links = new ArrayList<>();
    private final List<String> retainedToClear = new ArrayList<>();
    protected String prefix;

    /** @return tcp://127.0.0.1:port of the broker under test */
    protected abstract String serverUri();

    @BeforeEach
    public void newPrefix() {
        prefix = "loopstand-test/" + UUID.randomUUID().toString().substring(0, 8) + "/";
    }

    @AfterEach
    public void closeLinks() throws Exception {
        if (!retainedToClear.isEmpty()) {
            MqttLink cleaner = started(id("cleaner"), b -> b.cleanStart(true).sessionExpirySeconds(0));
            for (String topic : retainedToClear) {
                cleaner.publish(new OutboundMessage(topic, new byte[0], Qos.AT_LEAST_ONCE, true, 0)).get();
            }
        }
        links.forEach(MqttLink::close);
        links.clear();
    }

    protected String id(String name) {
        return prefix.replace('/', '-') + name;
    }

    protected MqttLinkConfig.Builder config(String clientId) {
        return MqttLinkConfig.builder().serverUri(serverUri()).clientId(clientId)
                .reconnectBackoff(200, 1_000, 0.2).connectTimeoutMs(5_000);
    }

    /** A link that is not started yet (subscribe first when messages of a resumed session matter). */
    protected MqttLink link(String clientId, UnaryOperator<MqttLinkConfig.Builder> customize) {
        MqttLink link = new MqttLink(customize.apply(config(clientId)).build(), WallClock.INSTANCE);
        links.add(link);
        return link;
    }

    protected MqttLink started(String clientId, UnaryOperator<MqttLinkConfig.Builder> customize)
            throws InterruptedException {
        MqttLink link = link(clientId, customize).start();
        assertThat(link.awaitConnected(10_000)).as("%s connected to %s", clientId, serverUri()).isTrue();
        return link;
    }

    protected static OutboundMessage qos1(String topic, String payload) {
        return OutboundMessage.of(topic, payload.getBytes(UTF_8), Qos.AT_LEAST_ONCE);
    }

    @Test
    public void shouldDeliverMessagePublishedByOneLinkToAnother() throws Exception {
        MqttLink sub = started(id("sub"), b -> b);
        Inbox inbox = new Inbox();
        sub.subscribe(prefix + "area/+/freq", Qos.AT_LEAST_ONCE, inbox);
        MqttLink pub = started(id("pub"), b -> b);

        pub.publish(qos1(prefix + "area/north/freq", "49.98")).get();

        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 1);
        InboundMessage m = inbox.messages().get(0);
        assertThat(m.topic()).isEqualTo(prefix + "area/north/freq");
        assertThat(new String(m.payload(), UTF_8)).isEqualTo("49.98");
        assertThat(m.qos()).isEqualTo(Qos.AT_LEAST_ONCE);
        assertThat(m.retained()).isFalse();
        assertThat(pub.counters().sent()).isEqualTo(1);
        assertThat(sub.counters().received()).isEqualTo(1);
        // The socket factory must switch Nagle off (DESIGN: pitfalls; measured here, no outside source).
        assertThat(sub.socketForTest().getTcpNoDelay()).isTrue();
        // MQTT 5 §3.2.2.3.3: Receive Maximum is 1..65535 (65535 when absent).
        assertThat(pub.inflightLimit()).isBetween(1, 65_535);
    }

    @Test
    public void shouldNotDeliverAPacketOverTheMaximumPacketSize() throws Exception {
        MqttLink sub = started(id("sub"), b -> b);
        Inbox inbox = new Inbox();
        sub.subscribe(prefix + "big/#", Qos.AT_LEAST_ONCE, inbox);
        MqttLink pub = started(id("pub"), b -> b);
        byte[] huge = new byte[1 << 20]; // 1 MiB, 8 × the limit
        java.util.Arrays.fill(huge, (byte) 'x');
        try {
            pub.publish(OutboundMessage.of(prefix + "big/huge", huge, Qos.AT_LEAST_ONCE)).get(10, java.util.concurrent.TimeUnit.SECONDS);
        } catch (java.util.concurrent.ExecutionException | java.util.concurrent.TimeoutException refusedOnTheWay) {
            // refused by the publisher's client or the broker: either way the transport stopped it
        }
        MqttLink pub2 = started(id("pub2"), b -> b);
        pub2.publish(qos1(prefix + "big/small", "after")).get();
        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.payloads().contains("after"));
        assertThat(inbox.messages()).allSatisfy(m -> assertThat(m.payload().length)
                .isLessThanOrEqualTo(PacketLimits.MAX_PACKET_BYTES));
        assertThat(inbox.payloads()).containsExactly("after");
    }

    @Test
    public void shouldRedeliverQos1MessagesPublishedWhileSubscriberWasCutOff() throws Exception {
        // MQTT 5 §4.4 / §3.1.2.4: with Clean Start 0 and a session expiry, QoS 1 messages for the
        // session's subscriptions are stored while it is disconnected and sent when it returns.
        MqttLink sub = started(id("sub"), b -> b.cleanStart(false).sessionExpirySeconds(60)
                .reconnectBackoff(1_500, 3_000, 0.1));
        Inbox inbox = new Inbox();
        sub.subscribe(prefix + "cmd/#", Qos.AT_LEAST_ONCE, inbox);
        MqttLink pub = started(id("pub"), b -> b);

        sub.killForTest();
        await().atMost(Duration.ofSeconds(5)).until(() -> !sub.isConnected());
        for (int i = 1; i <= 5; i++) {
            pub.publish(qos1(prefix + "cmd/unit-1", "pulse-" + i)).get();
        }

        await().atMost(Duration.ofSeconds(15)).until(() -> inbox.size() >= 5);
        assertThat(inbox.payloads()).containsExactly("pulse-1", "pulse-2", "pulse-3", "pulse-4", "pulse-5");
        assertThat(sub.counters().reconnects()).isEqualTo(1);
    }

    @Test
    public void shouldResumeSessionQueueWhenSameClientIdReturns() throws Exception {
        // MQTT 5 §3.1.2.4 (Clean Start 0 resumes the session), §3.1.2.11.2 (Session Expiry Interval).
        String subId = id("returning");
        MqttLink first = started(subId, b -> b.cleanStart(false).sessionExpirySeconds(60));
        first.subscribe(prefix + "cmd/#", Qos.AT_LEAST_ONCE, new Inbox());
        first.close();
        MqttLink pub = started(id("pub"), b -> b);
        for (int i = 1; i <= 3; i++) {
            pub.publish(qos1(prefix + "cmd/unit-2", "set-" + i)).get();
        }

        Inbox inbox = new Inbox();
        MqttLink second = link(subId, b -> b.cleanStart(false).sessionExpirySeconds(60));
        second.subscribe(prefix + "cmd/#", Qos.AT_LEAST_ONCE, inbox);
        second.start();

        await().atMost(Duration.ofSeconds(10)).until(() -> inbox.size() >= 3);
        assertThat(inbox.payloads()).containsExactly("set-1", "set-2", "set-3");
    }

    @Test
    public void shouldDeliverRetainedStatusToLateSubscriber() throws Exception {
        String topic = prefix + "unit/u7/status";
        retainedToClear.add(topic);
        MqttLink pub = started(id("pub"), b -> b);
        pub.publish(new OutboundMessage(topic, "online".getBytes(UTF_8), Qos.AT_LEAST_ONCE, true, 0)).get();

        MqttLink late = started(id("late"), b -> b);
        Inbox inbox = new Inbox();
        late.subscribe(prefix + "unit/+/status", Qos.AT_LEAST_ONCE, inbox);
        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 1);
        pub.publish(new OutboundMessage(topic, "tripped".getBytes(UTF_8), Qos.AT_LEAST_ONCE, true, 0)).get();
        await().atMost(Duration.ofSeconds(5)).until(() -> inbox.size() == 2);

        // MQTT 5 §3.3.1.3: a retained message sent because of a new subscription has RETAIN 1; a live
        // one forwarded to an existing subscription (Retain As Published 0) has RETAIN 0.
        assertThat(inbox.payloads()).containsExactly("online", "tripped");
        assertThat(inbox.messages().get(0).retained()).isTrue();
        assertThat(inbox.messages().get(1).retained()).isFalse();
    }

    @Test
    public void shouldPublishLastWillOnAbruptDisconnectButNotOnCleanClose() throws Exception {
        MqttLink watcher = started(id("watcher"), b -> b);
        Inbox wills = new Inbox();
        watcher.subscribe(prefix + "alive/+", Qos.AT_LEAST_ONCE, wills);
        MqttLink crashing = started(id("crashing"), b -> b.lastWill(prefix + "alive/crashing",
                "lost".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false));
        MqttLink tidy = started(id("tidy"), b -> b.lastWill(prefix + "alive/tidy",
                "lost".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false));

        // MQTT 5 §3.1.2.5: the Will Message is published when the network connection closes without a
        // DISCONNECT with reason code 0x00; §3.14.4: a normal DISCONNECT deletes it.
        crashing.killForTest();
        await().atMost(Duration.ofSeconds(10)).until(() -> wills.size() == 1);
        assertThat(wills.messages().get(0).topic()).isEqualTo(prefix + "alive/crashing");
        assertThat(wills.payloads()).containsExactly("lost");

        tidy.close();
        await().atMost(Duration.ofSeconds(10)).until(crashing::isConnected);
        crashing.close();
        await().during(Duration.ofMillis(1_500)).atMost(Duration.ofSeconds(3)).until(() -> wills.size() == 1);
    }

    @Test
    public void shouldNotDeliverExpiredMessageToReturningSubscriber() throws Exception {
        String subId = id("expiry");
        MqttLink first = started(subId, b -> b.cleanStart(false).sessionExpirySeconds(60));
        first.subscribe(prefix + "meter/#", Qos.AT_LEAST_ONCE, new Inbox());
        first.close();
        MqttLink pub = started(id("pub"), b -> b);
        pub.publish(new OutboundMessage(prefix + "meter/a1", "stale".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false, 1)).get();
        pub.publish(new OutboundMessage(prefix + "meter/a1", "keeps".getBytes(UTF_8), Qos.AT_LEAST_ONCE, false, 0)).get();

        // MQTT 5 §3.3.2.3.3: once the Message Expiry Interval has passed and the message has not been
        // delivered onwards to a subscriber, the server must not deliver it.
        await().pollDelay(Duration.ofMillis(2_500)).atMost(Duration.ofSeconds(5)).until(() -> true);
        Inbox inbox = new Inbox();
        MqttLink second = link(subId, b -> b.cleanStart(false).sessionExpirySeconds(60));
        second.subscribe(prefix + "meter/#", Qos.AT_LEAST_ONCE, inbox);
        second.start();

        await().atMost(Duration.ofSeconds(10)).until(() -> inbox.payloads().contains("keeps"));
        await().during(Duration.ofMillis(1_000)).atMost(Duration.ofSeconds(3))
                .until(() -> !inbox.payloads().contains("stale"));
        assertThat(inbox.payloads()).containsExactly("keeps");
    }
}
