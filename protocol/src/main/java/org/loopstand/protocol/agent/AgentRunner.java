package org.loopstand.protocol.agent;

import java.util.Objects;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.locks.LockSupport;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Drives an {@link Agent} on a dedicated thread: calls {@code doWork()} in a loop and parks for at
 * most {@code idleNanos} of wall time when no work was done. The agent decides from its own clock
 * what is due; the runner only keeps it turning. A producer that hands the agent work from another
 * thread calls {@link #wake()}, which ends the park at once, so queued work does not wait out the
 * idle period (the agent itself still never sleeps).
 */
public final class AgentRunner implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(AgentRunner.class);

    private final Agent agent;
    private final long idleNanos;
    private final AtomicBoolean running = new AtomicBoolean();
    private final CountDownLatch closed = new CountDownLatch(1);
    private volatile Throwable failure;
    private volatile Thread thread;
    /** Set by the runner just before it parks, cleared after. */
    private volatile boolean parked;
    /** Set by {@link #wake()}; cleared by the runner before each {@code doWork()}. */
    private volatile boolean wakePending;

    /**
     * @param agent     the agent to drive
     * @param idleNanos wall time to park when idle, ns, 1 µs – 100 ms
     */
    public AgentRunner(Agent agent, long idleNanos) {
        this.agent = Objects.requireNonNull(agent, "agent");
        if (idleNanos < 1_000L || idleNanos > 100_000_000L) {
            throw new IllegalArgumentException("idleNanos must be in [1000, 100000000], got " + idleNanos);
        }
        this.idleNanos = idleNanos;
    }

    /** Starts the thread; the agent's {@code onStart()} runs on it. */
    public synchronized AgentRunner start() {
        if (!running.compareAndSet(false, true)) {
            throw new IllegalStateException(agent.roleName() + " already started");
        }
        thread = new Thread(this::run, agent.roleName());
        thread.setDaemon(true);
        thread.start();
        return this;
    }

    private void run() {
        try {
            agent.onStart();
            while (running.get()) {
                wakePending = false;
                if (agent.doWork() == 0) {
                    // Dekker-style hand-shake on two volatiles: a wake() after doWork() either
                    // sees parked and unparks, or the runner sees wakePending and does not park.
                    parked = true;
                    if (!wakePending) {
                        LockSupport.parkNanos(idleNanos);
                    }
                    parked = false;
                }
            }
        } catch (Throwable t) {
            failure = t;
            LOG.error("{} stopped on an error", agent.roleName(), t);
        } finally {
            try {
                agent.onClose();
            } catch (RuntimeException e) {
                LOG.warn("{} failed to close cleanly", agent.roleName(), e);
            }
            running.set(false);
            closed.countDown();
        }
    }

    /**
     * Ends the runner's idle park now (or makes the next one return at once). Safe from any thread,
     * before start and after close; cheap while the agent is busy (no unpark then).
     */
    public void wake() {
        wakePending = true;
        if (parked) {
            Thread t = thread;
            if (t != null) {
                LockSupport.unpark(t);
            }
        }
    }

    /** @return true while the agent thread runs */
    public boolean isRunning() {
        return running.get();
    }

    /** @return the error that stopped the agent, or null */
    public Throwable failure() {
        return failure;
    }

    /** Stops the loop and waits for {@code onClose()} to finish. */
    @Override
    public void close() {
        running.set(false);
        Thread t;
        synchronized (this) {
            t = thread;
        }
        if (t != null && t != Thread.currentThread()) {
            try {
                closed.await();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
