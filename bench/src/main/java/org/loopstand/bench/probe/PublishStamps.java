package org.loopstand.bench.probe;

import java.util.Iterator;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;
import org.HdrHistogram.Recorder;
import org.loopstand.protocol.bus.InboundMessage;

/**
 * The in-process latency path: the plant side stamps the monotonic time of each measured-value
 * publish (key topic + seq), the controller side looks the stamp up once the message has been
 * decoded and validated. Both sides read the same JVM clock, so the difference is exact to the ns.
 * Stamps that find no arrival within {@link #EXPIRE_NANOS} are counted as lost and removed, so the map
 * stays bounded.
 */
public final class PublishStamps {
    /** A stamp older than this is taken as a message that never arrived. */
    public static final long EXPIRE_NANOS = 10_000_000_000L;

    private final Map<String, Long> stamps = new ConcurrentHashMap<>();
    private final Recorder publishToValidatedUs = new Recorder(3);
    private final Recorder publishToArrivalUs = new Recorder(3);
    private final LongAdder stamped = new LongAdder();
    private final LongAdder matched = new LongAdder();
    private final LongAdder unmatched = new LongAdder();
    private final LongAdder expired = new LongAdder();

    private static String key(String topic, long seq) {
        return topic + '#' + seq;
    }

    /** Plant side, at publish. */
    public void stamp(String topic, byte[] payload, long nowNanos) {
        long seq = SeqPeek.seq(payload);
        if (seq >= 0) {
            stamps.put(key(topic, seq), nowNanos);
            stamped.increment();
        }
    }

    /** Controller side, after decode and validation ({@code IntakeRouter.RouteProbe}). */
    public void routed(InboundMessage m, long routedNanos) {
        long seq = SeqPeek.seq(m.payload());
        Long sent = seq < 0 ? null : stamps.remove(key(m.topic(), seq));
        if (sent == null) {
            unmatched.increment();
            return;
        }
        matched.increment();
        publishToValidatedUs.recordValue(Math.max(0, (routedNanos - sent) / 1000));
        publishToArrivalUs.recordValue(Math.max(0, (m.receivedNanos() - sent) / 1000));
    }

    /** Removes stamps older than {@link #EXPIRE_NANOS}; call now and then. @return how many */
    public int expire(long nowNanos) {
        int n = 0;
        for (Iterator<Long> it = stamps.values().iterator(); it.hasNext(); ) {
            if (nowNanos - it.next() > EXPIRE_NANOS) {
                it.remove();
                n++;
            }
        }
        expired.add(n);
        return n;
    }

    /**
     * At the end of a run: counts stamps published before {@code cutoffNanos} as lost (they had time
     * to arrive) and forgets the rest (still on their way when the controller stopped).
     */
    public void settle(long cutoffNanos) {
        for (Iterator<Long> it = stamps.values().iterator(); it.hasNext(); ) {
            if (it.next() < cutoffNanos) {
                expired.increment();
            }
            it.remove();
        }
    }

    public Recorder publishToValidatedUs() { return publishToValidatedUs; }
    public Recorder publishToArrivalUs() { return publishToArrivalUs; }
    public long stamped() { return stamped.sum(); }
    public long matched() { return matched.sum(); }
    /** @return routed messages without a stamp (not measured: e.g. acks, or a stamp already expired) */
    public long unmatched() { return unmatched.sum(); }
    /** @return stamps that never found their message within the expiry: messages lost on the way */
    public long expired() { return expired.sum(); }
    public int pending() { return stamps.size(); }
}
