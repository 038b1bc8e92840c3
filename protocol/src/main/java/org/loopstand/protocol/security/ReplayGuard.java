package org.loopstand.protocol.security;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Optional;

/**
 * Refuses a command whose (epoch, seq) is not above the highest accepted so far for the same unit
 * and controller. A new controller epoch (takeover, restart) may start its seq again from 0; an
 * older epoch is always a replay. Thread-safe.
 *
 * <p>Memory is bounded: past {@code maxTracked} (unit, controller) pairs the least recently used
 * pair is forgotten, and its last accepted issuedAt becomes a floor. A pair not tracked is accepted
 * only for a command issued after that floor, so forgetting never lets an old command back in; at
 * worst a fresh pair's command issued before the floor is refused (safe side).
 */
public final class ReplayGuard {
    /** Default number of (unit, controller) pairs tracked. */
    public static final int DEFAULT_MAX_TRACKED = 100_000;

    private record Last(long epoch, long seq, long issuedAtMs) {
    }

    private final int maxTracked;
    private final LinkedHashMap<String, Last> last;
    private long forgottenFloorMs = Long.MIN_VALUE;
    private long forgottenPairs;

    /** Guard tracking up to {@value #DEFAULT_MAX_TRACKED} pairs. */
    public ReplayGuard() {
        this(DEFAULT_MAX_TRACKED);
    }

    /** @param maxTracked most (unit, controller) pairs remembered, ≥ 1 */
    public ReplayGuard(int maxTracked) {
        if (maxTracked < 1) {
            throw new IllegalArgumentException("maxTracked must be >= 1, got " + maxTracked);
        }
        this.maxTracked = maxTracked;
        this.last = new LinkedHashMap<>(16, 0.75f, true);
    }

    /**
     * Accepts and records the command's position, or says why it is a replay. Call only after the
     * signature has been verified, so that a forger cannot push the high-water mark.
     *
     * @return empty when accepted (and recorded); otherwise the refusal detail
     */
    public synchronized Optional<String> tryAccept(String unit, String controllerId, long epoch, long seq,
            long issuedAtMs) {
        String pair = unit + '\u0000' + controllerId;
        Last seen = last.get(pair);
        if (seen == null) {
            if (issuedAtMs <= forgottenFloorMs) {
                return Optional.of("no record for " + unit + "/" + controllerId + " and issuedAt " + issuedAtMs
                        + " is not after the forgotten-pairs floor " + forgottenFloorMs);
            }
        } else if (epoch < seen.epoch || (epoch == seen.epoch && seq <= seen.seq)) {
            return Optional.of("epoch " + epoch + " seq " + seq + " is not after the last accepted epoch "
                    + seen.epoch + " seq " + seen.seq + " from " + controllerId);
        }
        last.put(pair, new Last(epoch, seq, issuedAtMs));
        if (last.size() > maxTracked) {
            Map.Entry<String, Last> eldest = last.entrySet().iterator().next();
            forgottenFloorMs = Math.max(forgottenFloorMs, eldest.getValue().issuedAtMs);
            last.remove(eldest.getKey());
            forgottenPairs++;
        }
        return Optional.empty();
    }

    /** @return the number of pairs currently remembered */
    public synchronized int trackedPairs() {
        return last.size();
    }

    /** @return how many pairs were forgotten to keep memory bounded */
    public synchronized long forgottenPairs() {
        return forgottenPairs;
    }
}
