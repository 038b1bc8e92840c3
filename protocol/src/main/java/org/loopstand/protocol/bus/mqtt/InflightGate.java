package org.loopstand.protocol.bus.mqtt;

import java.util.concurrent.Semaphore;

/**
 * Limits QoS 1 publishes in flight to the broker's Receive Maximum (from the CONNACK). Past the limit
 * Paho fails with "too many publishes in progress" (32202); the gate lets the link refuse early with
 * back-pressure instead. A permit is taken before a publish and given back when it completes or fails.
 * The limit may change on every (re)connect.
 */
final class InflightGate {
    /** A Semaphore whose permits can be taken away when the limit shrinks. */
    private static final class ResizableSemaphore extends Semaphore {
        private static final long serialVersionUID = 1L;

        ResizableSemaphore() {
            super(0);
        }

        void reduce(int permits) {
            reducePermits(permits);
        }
    }

    private final ResizableSemaphore permits = new ResizableSemaphore();
    private int limit;

    /** @param newLimit in-flight limit, ≥ 1 (MQTT Receive Maximum is 1..65535) */
    synchronized void resize(int newLimit) {
        if (newLimit < 1) {
            throw new IllegalArgumentException("in-flight limit must be ≥ 1, got " + newLimit);
        }
        int delta = newLimit - limit;
        if (delta > 0) {
            permits.release(delta);
        } else if (delta < 0) {
            // Publishes already in flight above the new limit finish normally; until then none start.
            permits.reduce(-delta);
        }
        limit = newLimit;
    }

    /** @return true when a publish may start; never blocks */
    boolean tryAcquire() {
        return permits.tryAcquire();
    }

    /** Gives back the permit of one publish that completed or failed. */
    void release() {
        permits.release();
    }

    synchronized int limit() {
        return limit;
    }

    /** @return permits free now; negative right after the limit shrank below what is in flight */
    int available() {
        return permits.availablePermits();
    }
}
