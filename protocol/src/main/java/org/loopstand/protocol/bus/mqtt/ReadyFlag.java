package org.loopstand.protocol.bus.mqtt;

import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import java.util.function.BooleanSupplier;

/** Whether a link is connected and resubscribed, with a wait for it; thread-safe. */
final class ReadyFlag {
    private final ReentrantLock lock = new ReentrantLock();
    private final Condition changed = lock.newCondition();
    private volatile boolean ready;

    boolean get() {
        return ready;
    }

    void set(boolean value) {
        lock.lock();
        try {
            ready = value;
            changed.signalAll();
        } finally {
            lock.unlock();
        }
    }

    /** @return true if it was ready and is now cleared (exactly one caller wins) */
    boolean clearIfSet() {
        lock.lock();
        try {
            if (!ready) {
                return false;
            }
            ready = false;
            changed.signalAll();
            return true;
        } finally {
            lock.unlock();
        }
    }

    /**
     * @param timeoutMs ≥ 0
     * @param giveUp    checked on every wake-up; true stops the wait (e.g. the link was closed)
     * @return true when ready within the time
     */
    boolean await(long timeoutMs, BooleanSupplier giveUp) throws InterruptedException {
        long leftNanos = TimeUnit.MILLISECONDS.toNanos(timeoutMs);
        lock.lock();
        try {
            while (!ready && leftNanos > 0 && !giveUp.getAsBoolean()) {
                leftNanos = changed.awaitNanos(leftNanos);
            }
            return ready;
        } finally {
            lock.unlock();
        }
    }
}
