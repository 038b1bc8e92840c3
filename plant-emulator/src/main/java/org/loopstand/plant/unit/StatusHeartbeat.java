package org.loopstand.plant.unit;

/**
 * The controller's heartbeat as a unit's watchdog counts it: armed by the first live status of an
 * accepted controller, fed by each later one, restarted by an operator's return to remote. The retained
 * copy a new subscription brings is not a beat: it is the controller's last word, perhaps old, and on a
 * broker cluster the live statuses may only start once the subscription has reached the controller's
 * node. Times are the unit clock's monotonic readings (scenario ns). Owner thread only.
 */
final class StatusHeartbeat {
    private boolean armed;
    private long lastNanos;

    /** A live status was taken at {@code nowNanos}: arms the watchdog, or feeds it. */
    void beat(long nowNanos) {
        lastNanos = nowNanos;
        armed = true;
    }

    /** A fresh watchdog period from {@code nowNanos} on (an order back to remote); arms nothing. */
    void restart(long nowNanos) {
        lastNanos = nowNanos;
    }

    /** @return scenario ns since the last live status, or -1 while not armed */
    long ageNanos(long nowNanos) {
        return armed ? nowNanos - lastNanos : -1;
    }

    /** @return true when armed and no live status came for more than {@code watchdogS} seconds (&gt; 0) */
    boolean overdue(long nowNanos, double watchdogS) {
        return armed && nowNanos - lastNanos > watchdogS * 1e9;
    }
}
