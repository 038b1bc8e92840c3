package org.loopstand.plant.unit;

import org.HdrHistogram.Histogram;

/**
 * Times from a command's receipt at the plant interface to the first load-reference change and to the
 * first visible change of output, in scenario microseconds. Only the latest accepted command is
 * followed (a newer one replaces it). Output counts as changed once it has moved by at least
 * {@value #VISIBLE_MW} MW in the command's direction.
 *
 * <p>Two significant digits (1 % resolution), auto-resized and allocated at the first record: a
 * fixed one-hour range at three digits cost 376 KB per unit, 3.8 GB of heap at 10,000 units.
 */
public final class CommandLatency {
    /** Smallest output change taken as visible, MW (above the physics' noise at a held reference). */
    public static final double VISIBLE_MW = 0.05;
    private static final long MAX_US = 3_600_000_000L;

    private static final int DIGITS = 2;
    private Histogram toReferenceUs;
    private Histogram toOutputUs;
    private long receivedNanos = Long.MIN_VALUE;
    private double outputAtReceiptMw;
    private double sign;
    private boolean referencePending;
    private boolean outputPending;
    private java.util.function.BiConsumer<String, Long> listener;

    /** Also tells {@code l} each value as recorded: ("toReference"|"toOutput", µs). Null: none. */
    public synchronized void listen(java.util.function.BiConsumer<String, Long> l) {
        this.listener = l;
    }

    /** Starts following an accepted command; {@code sign} +1 raise, −1 lower. */
    public synchronized void accepted(long receivedNanos, double outputMw, double sign) {
        this.receivedNanos = receivedNanos;
        this.outputAtReceiptMw = outputMw;
        this.sign = sign;
        referencePending = sign != 0;
        outputPending = sign != 0;
    }

    /** Called after each tick with what the unit did. */
    public synchronized void observe(long nowNanos, boolean referenceChanged, double outputMw) {
        if (referencePending && referenceChanged) {
            if (toReferenceUs == null) {
                toReferenceUs = newHistogram();
            }
            long us = clamp((nowNanos - receivedNanos) / 1_000);
            toReferenceUs.recordValue(us);
            referencePending = false;
            if (listener != null) {
                listener.accept("toReference", us);
            }
        }
        if (outputPending && sign * (outputMw - outputAtReceiptMw) >= VISIBLE_MW) {
            if (toOutputUs == null) {
                toOutputUs = newHistogram();
            }
            long us = clamp((nowNanos - receivedNanos) / 1_000);
            toOutputUs.recordValue(us);
            outputPending = false;
            if (listener != null) {
                listener.accept("toOutput", us);
            }
        }
    }

    private static Histogram newHistogram() {
        Histogram h = new Histogram(DIGITS);
        h.setAutoResize(true);
        return h;
    }

    private static long clamp(long us) {
        return Math.max(0, Math.min(MAX_US, us));
    }

    /** @return receipt → first load-reference change, µs of scenario time (a copy) */
    public synchronized Histogram toReferenceUs() {
        return toReferenceUs == null ? newHistogram() : toReferenceUs.copy();
    }

    /** @return receipt → first visible output change, µs of scenario time */
    public synchronized Histogram toOutputUs() {
        return toOutputUs == null ? newHistogram() : toOutputUs.copy();
    }
}
