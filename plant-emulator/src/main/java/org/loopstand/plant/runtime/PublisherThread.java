package org.loopstand.plant.runtime;

import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.LockSupport;

import org.loopstand.protocol.bus.BusException;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.TopicTree;

/**
 * One thread that publishes for every connection of a plant: a connection made through
 * {@link #wrap(LinkFactory)} only queues its publishes (bounded, in order), and this thread hands
 * them to the broker client, so the physics loop does not wait in the MQTT client (its locks, its
 * in-flight window, its socket). The future a publish returns completes as the client's does; when
 * the queue is full it fails at once with {@link BusException.Reason#BACK_PRESSURE} and is counted
 * ({@link #refusedFull()}), never dropped silently. Closing a wrapped connection first lets the
 * thread publish what it queued (up to {@value #CLOSE_WAIT_MS} ms of wall time).
 *
 * <p>Pacing ({@link TelemetryPacing}): {@code BURST} hands every publish on as soon as it is taken;
 * {@code SPREAD} lets the loop mark each physics step's unit pass ({@link StepPassMarks}) and spreads
 * that step's unit telemetry evenly over the step's wall period ({@link TelemetrySpread}: order kept,
 * nothing dropped, at once and counted when the thread is behind or the slots would be too close).
 */
public final class PublisherThread implements StepPassMarks {
    /** Longest wait for queued publishes when a connection closes, ms. */
    public static final long CLOSE_WAIT_MS = 2_000;

    /** Closest two spread slots may be, ns: finer than the thread's wake-up can keep is not worth a slot. */
    public static final long MIN_SLOT_GAP_NANOS = 50_000;

    private sealed interface Item permits Job, StepBegins, StepEnds {
    }

    private record Job(MessageBus bus, OutboundMessage message, CompletableFuture<Void> done) implements Item {
    }

    private record StepBegins() implements Item {
    }

    private record StepEnds(long markedAtNanos, long periodNanos) implements Item {
    }

    private static final StepBegins STEP_BEGINS = new StepBegins();

    /**
     * jobs and (spread only) step marks; jobs in it are bounded by the capacity ({@link #queuedJobs}). Burst: an
     * array of that capacity (no allocation per publish beyond the job); spread: linked, so that a mark always gets in
     */
    private final BlockingQueue<Item> queue;
    private final AtomicLong queuedJobs = new AtomicLong();
    private final int capacity;
    private final Clock wall;
    private final AtomicLong pending = new AtomicLong();
    private final AtomicLong published = new AtomicLong();
    private final AtomicLong refusedFull = new AtomicLong();
    private final Thread thread;
    /** the spread schedule (publisher thread only), null when pacing is burst */
    private final TelemetrySpread<Job> spread;

    /** Starts the thread (a daemon), pacing {@link TelemetryPacing#BURST}. */
    public PublisherThread(int capacity, Clock wall, String name) {
        this(capacity, wall, name, TelemetryPacing.BURST);
    }

    /**
     * Starts the thread (a daemon).
     *
     * @param capacity publishes that may wait, ≥ 1
     * @param wall     wall clock for the wait at close and the spread's slots
     * @param name     the thread's name
     * @param pacing   how a step's unit telemetry leaves
     */
    public PublisherThread(int capacity, Clock wall, String name, TelemetryPacing pacing) {
        if (capacity < 1) {
            throw new IllegalArgumentException("publisher queue capacity must be at least 1, got " + capacity);
        }
        this.capacity = capacity;
        this.wall = wall;
        this.spread = pacing == TelemetryPacing.SPREAD ? new TelemetrySpread<>(MIN_SLOT_GAP_NANOS) : null;
        this.queue = spread == null ? new ArrayBlockingQueue<>(capacity) : new LinkedBlockingQueue<>();
        this.thread = new Thread(spread == null ? this::run : this::runSpread, name);
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

    /** Loop thread: a step's unit pass begins (spread pacing only; else nothing). */
    @Override
    public void stepPassBegins() {
        if (spread != null) {
            queue.add(STEP_BEGINS);
        }
    }

    /** Loop thread: the step's unit pass ended; its telemetry is spread over {@code wallPeriodNanos} from now. */
    @Override
    public void stepPassEnds(long wallPeriodNanos) {
        if (spread != null) {
            queue.add(new StepEnds(wall.monotonicNanos(), wallPeriodNanos));
        }
    }

    /** @return the spread's figures (sent in a slot, at once behind, at once dense, early for order), or null for burst */
    public SpreadCounts spreadCounts() {
        return spread == null ? null : spreadCounts;
    }

    /** What the spread did, as read by other threads (updated by the publisher thread). */
    public static final class SpreadCounts {
        private volatile long spreadSlots;
        private volatile long atOnceBehind;
        private volatile long atOnceDense;
        private volatile long earlyForOrder;

        /** @return step telemetry sent in a slot of its own */
        public long spread() {
            return spreadSlots;
        }

        /** @return step telemetry sent at once because the thread was behind */
        public long atOnceBehind() {
            return atOnceBehind;
        }

        /** @return step telemetry sent at once because its slots would have been too close */
        public long atOnceDense() {
            return atOnceDense;
        }

        /** @return messages sent before their slot so that a later message of their connection is not overtaken */
        public long earlyForOrder() {
            return earlyForOrder;
        }

        @Override
        public String toString() {
            return "spread " + spreadSlots + ", at once behind " + atOnceBehind + ", at once dense " + atOnceDense
                    + ", early for order " + earlyForOrder;
        }
    }

    private final SpreadCounts spreadCounts = new SpreadCounts();

    private void runSpread() {
        while (true) {
            // counts first: whoever sees a message published then sees the counts of its schedule
            SpreadCounts c = spreadCounts;
            c.spreadSlots = spread.spread();
            c.atOnceBehind = spread.sentAtOnceBehind();
            c.atOnceDense = spread.sentAtOnceDense();
            c.earlyForOrder = spread.sentEarlyForOrder();
            long now = wall.monotonicNanos();
            long next = spread.sendDue(now, this::publish);
            long waitNanos = next == Long.MAX_VALUE ? 100_000_000L : next - now;
            Item it;
            try {
                it = waitNanos <= 0 ? queue.poll() : queue.poll(waitNanos, TimeUnit.NANOSECONDS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
            for (; it != null; it = queue.poll()) {
                long at = wall.monotonicNanos();
                if (it instanceof Job j) {
                    queuedJobs.decrementAndGet();
                    boolean telemetry = TopicTree.parse(j.message().topic())
                            .map(t -> t.kind() == TopicKind.UNIT_TELEMETRY).orElse(false);
                    spread.offer(j.bus(), j, telemetry, at);
                } else if (it instanceof StepEnds m) {
                    spread.stepEnds(m.markedAtNanos(), m.periodNanos(), Math.max(at, m.markedAtNanos()));
                } else {
                    spread.stepBegins();
                }
            }
        }
    }

    private void run() {
        while (true) {
            Item it;
            try {
                it = queue.poll(100, TimeUnit.MILLISECONDS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
            if (it instanceof Job j) {
                queuedJobs.decrementAndGet();
                publish(j);
            }
        }
    }

    private void publish(Job j) {
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

    private CompletableFuture<Void> enqueue(MessageBus bus, OutboundMessage message) {
        CompletableFuture<Void> done = new CompletableFuture<>();
        if (queuedJobs.incrementAndGet() > capacity) {
            queuedJobs.decrementAndGet();
            refusedFull.incrementAndGet();
            done.completeExceptionally(new BusException(BusException.Reason.BACK_PRESSURE,
                    "the plant's publisher queue is full (" + capacity + " messages waiting)"));
        } else {
            pending.incrementAndGet();
            queue.add(new Job(bus, message, done));
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
