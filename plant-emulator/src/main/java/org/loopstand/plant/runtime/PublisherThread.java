package org.loopstand.plant.runtime;

import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.LockSupport;

import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.time.Clock;

/**
 * One thread that publishes for every connection of a plant: a connection made through
 * {@link #wrap(LinkFactory)} only queues its publishes (bounded, in order), and this thread hands
 * them to the broker client, so the physics loop does not wait in the MQTT client (its locks, its
 * in-flight window, its socket). The future a publish returns completes as the client's does; when
 * the queue is full it fails at once with {@link BusException.Reason#BACK_PRESSURE} and is counted
 * ({@link #refusedFull()}), never dropped silently. Closing a wrapped connection first lets the
 * thread publish what it queued (up to {@value #CLOSE_WAIT_MS} ms of wall time).
 */
public final class PublisherThread {
    /** Longest wait for queued publishes when a connection closes, ms. */
    public static final long CLOSE_WAIT_MS = 2_000;

    private record Job(MessageBus bus, OutboundMessage message, CompletableFuture<Void> done) {
    }

    private final ArrayBlockingQueue<Job> queue;
    private final int capacity;
    private final Clock wall;
    private final AtomicLong pending = new AtomicLong();
    private final AtomicLong published = new AtomicLong();
    private final AtomicLong refusedFull = new AtomicLong();
    private final Thread thread;

    /**
     * Starts the thread (a daemon).
     *
     * @param capacity publishes that may wait, ≥ 1
     * @param wall     wall clock for the wait at close
     * @param name     the thread's name
     */
    public PublisherThread(int capacity, Clock wall, String name) {
        if (capacity < 1) {
            throw new IllegalArgumentException("publisher queue capacity must be at least 1, got " + capacity);
        }
        this.capacity = capacity;
        this.queue = new ArrayBlockingQueue<>(capacity);
        this.wall = wall;
        this.thread = new Thread(this::run, name);
        this.thread.setDaemon(true);
        this.thread.start();
    }

    /** @return connections from {@code links} whose publishes go through this thread */
    public LinkFactory wrap(LinkFactory links) {
        return (clientId, lastWill) -> new QueuedLink(this, links.connect(clientId, lastWill));
    }

    /** @return the connection behind {@code bus} when it publishes through a publisher thread, else {@code bus} */
    public static MessageBus unwrap(MessageBus bus) {
        return bus instanceof QueuedLink q ? q.connection() : bus;
    }

    /** @return publishes handed to the broker client so far */
    public long published() {
        return published.get();
    }

    /** @return publishes refused because the queue was full */
    public long refusedFull() {
        return refusedFull.get();
    }

    private void run() {
        while (true) {
            Job j;
            try {
                j = queue.poll(100, TimeUnit.MILLISECONDS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
            if (j == null) {
                continue;
            }
            try {
                j.bus().publish(j.message()).whenComplete((v, e) -> {
                    if (e == null) {
                        j.done().complete(null);
                    } else {
                        j.done().completeExceptionally(e);
                    }
                });
                published.incrementAndGet();
            } catch (RuntimeException e) {
                j.done().completeExceptionally(e);
            } finally {
                pending.decrementAndGet();
            }
        }
    }

    private CompletableFuture<Void> enqueue(MessageBus bus, OutboundMessage message) {
        CompletableFuture<Void> done = new CompletableFuture<>();
        pending.incrementAndGet();
        if (!queue.offer(new Job(bus, message, done))) {
            pending.decrementAndGet();
            refusedFull.incrementAndGet();
            done.completeExceptionally(new BusException(BusException.Reason.BACK_PRESSURE,
                    "the plant's publisher queue is full (" + capacity + " messages waiting)"));
        }
        return done;
    }

    private void awaitDrained() {
        long deadline = wall.monotonicNanos() + CLOSE_WAIT_MS * 1_000_000L;
        while (pending.get() > 0 && wall.monotonicNanos() < deadline) {
            LockSupport.parkNanos(1_000_000L);
        }
    }

    private static final class QueuedLink extends ForwardingBus {
        private final PublisherThread owner;

        QueuedLink(PublisherThread owner, MessageBus inner) {
            super(inner);
            this.owner = owner;
        }

        MessageBus connection() {
            return inner;
        }

        @Override
        public CompletableFuture<Void> publish(OutboundMessage message) {
            return owner.enqueue(inner, message);
        }

        @Override
        public void close() {
            owner.awaitDrained();
            inner.close();
        }
    }
}
