package org.loopstand.app.replay;

import org.loopstand.protocol.time.Clock;

/**
 * The replay's virtual clock: it reads what the replay last set, nothing else. Scenario time (epoch ms)
 * and the monotonic reading (ns) are set apart, because the journal records them apart: a controller
 * that followed the plant's clock in real time started its cycles on a monotonic reading that is not
 * just its epoch ms times a million. Single thread.
 */
final class ReplayClock implements Clock {
    private long epochMs;
    /** before any cycle schedule: a lockstep run's schedule starts at 0, and the replay sets one ns before it */
    private long monotonicNs = Long.MIN_VALUE;

    /** @param epochMs scenario time from now on, epoch ms */
    void setEpochMillis(long epochMs) {
        this.epochMs = epochMs;
    }

    /** @param monotonicNs monotonic reading from now on, ns (never set back: the cycle schedule counts on it) */
    void setMonotonicNanos(long monotonicNs) {
        if (monotonicNs < this.monotonicNs) {
            throw new IllegalStateException("monotonic time set back from " + this.monotonicNs + " to " + monotonicNs);
        }
        this.monotonicNs = monotonicNs;
    }

    @Override
    public long epochMillis() {
        return epochMs;
    }

    @Override
    public long monotonicNanos() {
        return monotonicNs;
    }
}
