package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;

import org.junit.jupiter.api.Test;
import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.memory.DeliveryMode;
import org.loopstand.protocol.bus.memory.InMemoryBroker;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.VirtualClock;
import org.loopstand.protocol.time.WallClock;

class PublisherThreadTest {
    final VirtualClock clock = new VirtualClock(1_700_000_000_000L);
    final InMemoryBroker broker = new InMemoryBroker(clock, DeliveryMode.DIRECT);

    @Test
    void shouldPublishEveryMessageInOrderFromItsOwnThread() throws Exception {
        Inbox inbox = new Inbox();
        broker.connect("tester").subscribe("t/#", Qos.AT_LEAST_ONCE, inbox);
        List<String> publishingThreads = new java.util.concurrent.CopyOnWriteArrayList<>();
        PublisherThread publisher = new PublisherThread(1_000, WallClock.INSTANCE, "test-publisher");
        MessageBus link = publisher.wrap((id, will) -> new ForwardingBus(broker.connect(id, will)) {
            @Override
            public CompletableFuture<Void> publish(OutboundMessage m) {
                publishingThreads.add(Thread.currentThread().getName());
                return super.publish(m);
            }
        }).connect("plant", null);
        CompletableFuture<Void> last = null;
        for (int i = 0; i < 200; i++) {
            last = link.publish(OutboundMessage.of("t/" + (i % 3), new byte[] {(byte) i}, Qos.AT_MOST_ONCE));
        }
        last.get(10, TimeUnit.SECONDS);
        link.close(); // waits for what is queued
        assertThat(inbox.messages()).extracting(m -> m.payload()[0] & 0xff)
                .containsExactlyElementsOf(java.util.stream.IntStream.range(0, 200).boxed().toList());
        assertThat(publishingThreads).hasSize(200).containsOnly("test-publisher");
        assertThat(publisher.published()).isEqualTo(200);
        assertThat(publisher.refusedFull()).isZero();
    }

    @Test
    void shouldFailAPublishAtOnceAsBackPressureWhenItsQueueIsFull() throws Exception {
        CountDownLatch entered = new CountDownLatch(1);
        CountDownLatch release = new CountDownLatch(1);
        PublisherThread publisher = new PublisherThread(2, WallClock.INSTANCE, "test-publisher");
        MessageBus link = publisher.wrap((id, will) -> new ForwardingBus(broker.connect(id, will)) {
            @Override
            public CompletableFuture<Void> publish(OutboundMessage m) {
                entered.countDown();
                try {
                    release.await(10, TimeUnit.SECONDS); // a broker client that holds the thread up
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
                return super.publish(m);
            }
        }).connect("plant", null);
        link.publish(OutboundMessage.of("t/a", new byte[] {1}, Qos.AT_MOST_ONCE));
        assertThat(entered.await(10, TimeUnit.SECONDS)).isTrue();
        link.publish(OutboundMessage.of("t/a", new byte[] {2}, Qos.AT_MOST_ONCE));
        link.publish(OutboundMessage.of("t/a", new byte[] {3}, Qos.AT_MOST_ONCE));
        CompletableFuture<Void> refused = link.publish(OutboundMessage.of("t/a", new byte[] {4}, Qos.AT_MOST_ONCE));
        assertThat(refused).isCompletedExceptionally();
        assertThat(refused.handle((v, e) -> ((BusException) e).reason()).get()).isEqualTo(BusException.Reason.BACK_PRESSURE);
        assertThat(publisher.refusedFull()).isEqualTo(1);
        release.countDown();
        link.close();
        assertThat(publisher.published()).isEqualTo(3);
        assertThat(PublisherThread.unwrap(link)).isNotSameAs(link).isInstanceOf(MessageBus.class);
    }

    @Test
    void shouldSpreadMarkedStepsTelemetryKeepingEveryMessageAndItsOrder() throws Exception {
        Inbox inbox = new Inbox();
        broker.connect("tester").subscribe("loopstand/v1/site-a/#", Qos.AT_LEAST_ONCE, inbox);
        org.loopstand.protocol.topic.TopicTree topics = org.loopstand.protocol.topic.TopicTree.forSite("site-a");
        PublisherThread publisher = new PublisherThread(1_000, WallClock.INSTANCE, "test-publisher", TelemetryPacing.SPREAD);
        MessageBus link = publisher.wrap((id, will) -> broker.connect(id, will)).connect("plant", null);
        CompletableFuture<Void> last = null;
        int n = 0;
        for (int step = 0; step < 5; step++) {
            publisher.stepPassBegins();
            for (int u = 0; u < 4; u++) {
                last = link.publish(OutboundMessage.of(topics.unitTelemetry("u" + u), new byte[] {(byte) n++}, Qos.AT_MOST_ONCE));
            }
            publisher.stepPassEnds(2_000_000L); // 2 ms steps: 0.5 ms slots
        }
        last = link.publish(OutboundMessage.of(topics.unitAck("u0"), new byte[] {(byte) n++}, Qos.AT_MOST_ONCE));
        last.get(10, TimeUnit.SECONDS);
        link.close();
        assertThat(inbox.messages()).extracting(m -> m.payload()[0] & 0xff)
                .containsExactlyElementsOf(java.util.stream.IntStream.range(0, 21).boxed().toList());
        assertThat(publisher.published()).isEqualTo(21);
        PublisherThread.SpreadCounts c = publisher.spreadCounts();
        // each of the 20 telemetry messages left in its slot or at once and counted, none lost
        assertThat(c.spread() + c.atOnceBehind() + c.atOnceDense() + c.earlyForOrder()).isEqualTo(20);
        assertThat(c.atOnceDense()).isZero();
        assertThat(new PublisherThread(10, WallClock.INSTANCE, "burst").spreadCounts()).isNull();
    }
}
