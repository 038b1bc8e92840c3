package org.loopstand.plant.fault;

import java.util.random.RandomGenerator;

/**
 * A fault of the publication stage (loss, stale, timing, value), in the order the stage applies
 * them: {@link #shape} the record, then {@link #lossVerdict}, then {@link #delayMs} and
 * {@link #extraCopies}. A method draws from {@code random} only when its fault needs a draw, so a
 * seeded run repeats exactly.
 */
public interface StreamFault extends FaultBehaviour {
    /** Stale, clock and value faults change the outgoing record here. */
    default void shape(FaultSpec spec, MessageDraft draft) {
    }

    /** @return why this message is lost, or null when this fault lets it through */
    default String lossVerdict(StreamMemory memory, RandomGenerator random) {
        return null;
    }

    /** @return extra hold-back of this message, ms, ≥ 0 */
    default long delayMs(RandomGenerator random) {
        return 0;
    }

    /** @return extra copies of this message published, ≥ 0 */
    default int extraCopies(RandomGenerator random) {
        return 0;
    }

    /** @return true for a fault that loses messages in bursts (a burst ends with the last such fault) */
    default boolean keepsBurst() {
        return false;
    }
}
