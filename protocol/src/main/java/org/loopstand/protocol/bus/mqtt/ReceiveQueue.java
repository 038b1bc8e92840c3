package org.loopstand.protocol.bus.mqtt;

import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.time.Clock;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The link's one delivery thread and its bounded queue. Paho's callback thread only enqueues and
 * returns (a 1 ms block there caps intake near 900 msg/s); when the queue is full the message is
 * counted as dropped and a warning is logged at most once per second.
 */
final class ReceiveQueue {
    private static final Logger LOG = LoggerFactory.getLogger(ReceiveQueue.class);
    private static final long LOG_INTERVAL_NANOS = 1_000_000_000L;

    private final ThreadPoolExecutor executor;
    private final SubscriptionTable subscriptions;
    private final BusCounters counters;
    private final Clock clock;
    private final String clientId;
    private final AtomicLong lastDropLogNanos = new AtomicLong(Long.MIN_VALUE);
    private final AtomicLong droppedSinceLog = new AtomicLong();

    ReceiveQueue(String clientId, int capacity, SubscriptionTable subscriptions, BusCounters counters, Clock clock) {
        this.clientId = clientId;
        this.subscriptions = subscriptions;
        this.counters = counters;
        this.clock = clock;
        this.executor = new ThreadPoolExecutor(1, 1, 0, TimeUnit.MILLISECONDS, new ArrayBlockingQueue<>(capacity),
                r -> {
                    Thread t = new Thread(r, "mqtt-deliver-" + clientId);
                    t.setDaemon(true);
                    return t;
                }, new ThreadPoolExecutor.AbortPolicy());
    }

    /** Called on Paho's thread: never blocks. */
    void offer(InboundMessage message) {
        counters.onReceived();
        try {
            executor.execute(() -> dispatch(message));
        } catch (RejectedExecutionException e) {
            drop("receive queue full (" + executor.getQueue().remainingCapacity() + " free) or closed", message);
        }
    }

    private void dispatch(InboundMessage message) {
        var matching = subscriptions.matching(message.topic());
        if (matching.isEmpty()) {
            drop("no subscription matches", message);
            return;
        }
        for (SubscriptionTable.Entry entry : matching) {
            for (MessageListener listener : entry.listeners()) {
                try {
                    listener.onMessage(message);
                } catch (RuntimeException e) {
                    counters.onRejected();
                    LOG.warn("{}: listener of {} failed on a message from {}: {}", clientId, entry.filter(),
                            message.topic(), e.toString());
                }
            }
        }
    }

    private void drop(String why, InboundMessage message) {
        counters.onDropped();
        droppedSinceLog.incrementAndGet();
        long now = clock.monotonicNanos();
        long last = lastDropLogNanos.get();
        if ((last == Long.MIN_VALUE || now - last >= LOG_INTERVAL_NANOS) && lastDropLogNanos.compareAndSet(last, now)) {
            LOG.warn("{}: dropped {} received message(s) since the last report, latest on {}: {}", clientId,
                    droppedSinceLog.getAndSet(0), message.topic(), why);
        }
    }

    /** @return messages waiting for the delivery thread */
    int backlog() {
        return executor.getQueue().size();
    }

    /** Stops taking messages, lets queued ones finish for up to waitMs, then stops the thread. */
    void close(long waitMs) {
        executor.shutdown();
        try {
            if (!executor.awaitTermination(waitMs, TimeUnit.MILLISECONDS)) {
                executor.shutdownNow();
            }
        } catch (InterruptedException e) {
            executor.shutdownNow();
            Thread.currentThread().interrupt();
        }
    }
}
