package org.loopstand.controller.following;

import java.util.ArrayDeque;
import java.util.Deque;

/**
 * What {@link UnitFollowingMonitor} expects of one unit: the commanded target, the ramp-limited move
 * towards it and that move through the unit's response lag, with a short history of the expected output
 * (for readings that arrive after the unit's dead time), and the unit's following record (missed,
 * followed, flagged, probe). Owner thread only.
 */
final class FollowingTrack {
    final long lagMs;
    private final long deadTimeMs;
    boolean commanded;
    double lastDirection;
    double targetMw;
    /** the ramp-limited commanded move */
    double expectedMw;
    /** that move through the unit's response lag: what the unit's output should show */
    double laggedMw;
    long lastMs;
    long lastCommandMs = Long.MIN_VALUE / 2;
    int missed;
    int followed;
    boolean flagged;
    boolean probing;
    long nextProbeMs;
    long probeDeadlineMs;
    long lastJudgedMs = Long.MIN_VALUE;
    /** the largest governor uncertainty passed since the baseline, MW */
    double largestUncertaintyMw;
    /** how far the governor share at the baseline may have been off, MW */
    double baselineUncertaintyMw;
    final Deque<long[]> historyTimes = new ArrayDeque<>();
    final Deque<Double> historyValues = new ArrayDeque<>();

    /**
     * @param mw          the output it starts from, MW
     * @param nowMs       the time of that reading, epoch ms
     * @param lagMs       the unit's response lag, ms (0: none)
     * @param deadTimeMs  the unit's dead time, ms: the history kept covers twice it plus a minute and the lag
     */
    FollowingTrack(double mw, long nowMs, long lagMs, long deadTimeMs) {
        this.lagMs = lagMs;
        this.deadTimeMs = deadTimeMs;
        resync(mw, nowMs);
    }

    void resync(double mw, long nowMs) {
        targetMw = mw;
        expectedMw = mw;
        laggedMw = mw;
        lastMs = nowMs;
        historyTimes.clear();
        historyValues.clear();
        push(nowMs, mw);
    }

    void shift(double deltaMw) {
        targetMw += deltaMw;
        expectedMw += deltaMw;
        laggedMw += deltaMw;
        int n = historyValues.size();
        for (int i = 0; i < n; i++) {
            historyValues.addLast(historyValues.removeFirst() + deltaMw);
        }
    }

    void advance(long nowMs, double rampMwPerMin) {
        long dtMs = Math.max(0, nowMs - lastMs);
        double step = rampMwPerMin * dtMs / 60_000.0;
        double d = targetMw - expectedMw;
        double before = expectedMw;
        expectedMw += Math.max(-step, Math.min(step, d));
        if (lagMs <= 0) {
            laggedMw = expectedMw;
        } else if (dtMs > 0) {
            // first-order lag of a linear input over dt, exact: y = x − k·T + (y0 − x0 + k·T)·e^(−dt/T)
            double k = (expectedMw - before) / dtMs;
            double decay = Math.exp(-(double) dtMs / lagMs);
            laggedMw = expectedMw - k * lagMs + (laggedMw - before + k * lagMs) * decay;
        }
        lastMs = Math.max(lastMs, nowMs);
        push(nowMs, laggedMw);
    }

    /** Latest expected value at or before {@code tMs}; the oldest one if none is that old. */
    double expectedAt(long tMs) {
        double v = historyValues.peekFirst();
        var ti = historyTimes.iterator();
        var vi = historyValues.iterator();
        while (ti.hasNext()) {
            long t = ti.next()[0];
            double x = vi.next();
            if (t <= tMs) {
                v = x;
            } else {
                break;
            }
        }
        return v;
    }

    private void push(long tMs, double v) {
        historyTimes.addLast(new long[] {tMs});
        historyValues.addLast(v);
        // keep what the dead time needs plus a margin; bounded in count as well
        while (historyTimes.size() > 2 && (historyTimes.size() > 1024
                || historyTimes.peekFirst()[0] < tMs - 2 * deadTimeMs - 60_000 - lagMs)) {
            historyTimes.removeFirst();
            historyValues.removeFirst();
        }
    }
}
