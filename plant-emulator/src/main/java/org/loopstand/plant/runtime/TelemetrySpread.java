package org.loopstand.plant.runtime;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;

/**
 * When each waiting publish goes out, so that a physics step's unit telemetry leaves evenly over the
 * step's wall period instead of in one burst (the publisher thread's schedule; pure logic, the caller
 * gives every time, so a test steps it by hand). Owned by one thread.
 *
 * <p>The loop brackets each step's unit pass ({@link #stepBegins()}, {@link #stepEnds}); the unit
 * telemetry offered in between gets slots {@code markedAt + i × period / n}, i = 0 … n − 1, in the
 * order offered. Every other message (acks, link state, meters, telemetry outside a step pass) goes at
 * once, and takes every earlier message of its connection with it, so that no connection's messages
 * are ever reordered (counted {@link #sentEarlyForOrder()}). Every step telemetry message ends in
 * exactly one of the four counts (in its slot, early for order, at once behind, at once dense). Never a
 * backlog, never a drop:
 * <ul>
 *   <li>a step's mark that reaches this schedule more than one period after the loop set it, or the
 *       next step's mark while a step's slots are still ahead: those messages go at once, counted
 *       {@link #sentAtOnceBehind()} (the publisher fell behind; spreading would only add lag);</li>
 *   <li>slots closer than the minimum gap (high rates, many units): the step goes at once, counted
 *       {@link #sentAtOnceDense()} (the thread cannot wake that precisely).</li>
 * </ul>
 *
 * @param <T> what is sent
 */
public final class TelemetrySpread<T> {
    /** Slot of a step's telemetry whose step has not ended yet: not yet sendable. */
    private static final long UNSCHEDULED = Long.MAX_VALUE;

    private static final class Entry<T> {
        final Object connection;
        final T item;
        long sendAtNanos;

        Entry(Object connection, T item, long sendAtNanos) {
            this.connection = connection;
            this.item = item;
            this.sendAtNanos = sendAtNanos;
        }
    }

    private final long minGapNanos;
    /** every entry not yet sent, in the order offered; per connection, send times never decrease */
    private ArrayDeque<Entry<T>> waiting = new ArrayDeque<>();
    private ArrayDeque<Entry<T>> spare = new ArrayDeque<>();
    /** the open step's telemetry, in the order offered */
    private final List<Entry<T>> step = new ArrayList<>();
    private boolean inStep;
    private long spread;
    private long atOnceBehind;
    private long atOnceDense;
    private long earlyForOrder;
    private long sent;

    /** @param minGapNanos closest two slots may be, ns of wall time, ≥ 0 */
    public TelemetrySpread(long minGapNanos) {
        if (minGapNanos < 0) {
            throw new IllegalArgumentException("minimum gap must be ≥ 0 ns, got " + minGapNanos);
        }
        this.minGapNanos = minGapNanos;
    }

    /** A step's unit pass starts: its unit telemetry waits for {@link #stepEnds} to be given slots. */
    public void stepBegins() {
        inStep = true;
    }

    /**
     * Offers a message of {@code connection}.
     *
     * @param unitTelemetry true for a unit's telemetry (spread when inside a step pass)
     * @param nowNanos      wall time now, ns
     */
    public void offer(Object connection, T item, boolean unitTelemetry, long nowNanos) {
        if (unitTelemetry && inStep) {
            Entry<T> e = new Entry<>(connection, item, UNSCHEDULED);
            waiting.add(e);
            step.add(e);
            return;
        }
        for (Entry<T> e : waiting) { // the connection's earlier messages go first, at once
            if (e.connection == connection && e.sendAtNanos > nowNanos) {
                if (e.sendAtNanos != UNSCHEDULED) {
                    spread--; // it had a slot: it now leaves early instead
                }
                e.sendAtNanos = nowNanos;
                earlyForOrder++;
            }
        }
        waiting.add(new Entry<>(connection, item, nowNanos));
    }

    /**
     * The step's unit pass has ended: its telemetry gets its slots.
     *
     * @param markedAtNanos wall time the loop ended the pass, ns (the slots start there)
     * @param periodNanos   the step's wall period, ns, &gt; 0
     * @param nowNanos      wall time now, ns (≥ markedAtNanos)
     */
    public void stepEnds(long markedAtNanos, long periodNanos, long nowNanos) {
        if (periodNanos <= 0) {
            throw new IllegalArgumentException("step period must be > 0 ns, got " + periodNanos);
        }
        inStep = false;
        for (Entry<T> e : waiting) { // an earlier step still spreading: the publisher is behind
            if (e.sendAtNanos != UNSCHEDULED && e.sendAtNanos > nowNanos) {
                e.sendAtNanos = nowNanos;
                spread--;
                atOnceBehind++;
            }
        }
        List<Entry<T>> open = new ArrayList<>(step.size());
        for (Entry<T> e : step) {
            if (e.sendAtNanos == UNSCHEDULED) { // not taken at once by a later message of its connection
                open.add(e);
            }
        }
        step.clear();
        int n = open.size();
        if (n == 0) {
            return;
        }
        long gap = periodNanos / n;
        if (nowNanos - markedAtNanos > periodNanos) {
            open.forEach(e -> e.sendAtNanos = nowNanos);
            atOnceBehind += n;
        } else if (gap < minGapNanos) {
            open.forEach(e -> e.sendAtNanos = nowNanos);
            atOnceDense += n;
        } else {
            for (int i = 0; i < n; i++) {
                // never before now: keeps each connection's send times in offer order
                open.get(i).sendAtNanos = Math.max(nowNanos, markedAtNanos + i * gap);
            }
            spread += n;
        }
    }

    /**
     * Sends (in the order offered) every message due at {@code nowNanos}.
     *
     * @return the next message's send time, ns, or {@link Long#MAX_VALUE} when none is scheduled
     */
    public long sendDue(long nowNanos, Consumer<? super T> send) {
        long next = Long.MAX_VALUE;
        for (Entry<T> e; (e = waiting.poll()) != null; ) {
            if (e.sendAtNanos <= nowNanos) {
                sent++;
                send.accept(e.item);
            } else {
                spare.add(e);
                if (e.sendAtNanos != UNSCHEDULED) {
                    next = Math.min(next, e.sendAtNanos);
                }
            }
        }
        ArrayDeque<Entry<T>> t = waiting;
        waiting = spare;
        spare = t;
        return next;
    }

    /** @return messages not yet sent */
    public int waitingCount() {
        return waiting.size();
    }

    /** @return messages handed to {@code send} so far */
    public long sent() {
        return sent;
    }

    /** @return step telemetry given a slot of its own in a spread and not moved from it since */
    public long spread() {
        return spread;
    }

    /** @return step telemetry sent at once because the publisher was behind (late mark, or the next step came) */
    public long sentAtOnceBehind() {
        return atOnceBehind;
    }

    /** @return step telemetry sent at once because its slots would have been closer than the minimum gap */
    public long sentAtOnceDense() {
        return atOnceDense;
    }

    /** @return messages sent before their slot so that a later message of their connection is not overtaken */
    public long sentEarlyForOrder() {
        return earlyForOrder;
    }
}
