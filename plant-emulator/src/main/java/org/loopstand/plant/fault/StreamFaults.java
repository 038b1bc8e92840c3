package org.loopstand.plant.fault;

import java.util.random.RandomGenerator;

/** The loss, stale and timing faults of the publication stage; each record's components are its parameters. */
public final class StreamFaults {
    private StreamFaults() {
    }

    /** Each publication is dropped with a probability. */
    public record Drop(double dropProbability) implements StreamFault {
        @Override
        public String lossVerdict(StreamMemory memory, RandomGenerator random) {
            return random.nextDouble() < dropProbability ? "dropped" : null;
        }
    }

    /** Messages are lost in bursts of {@code burstLengthMessages}. */
    public record BurstLoss(double burstStartProbability, double burstLengthMessages) implements StreamFault {
        @Override
        public String lossVerdict(StreamMemory memory, RandomGenerator random) {
            if (memory.burstLeft > 0) {
                memory.burstLeft--;
                return "in a loss burst";
            }
            if (random.nextDouble() < burstStartProbability) {
                memory.burstLeft = (int) Math.round(burstLengthMessages) - 1;
                return "a loss burst started";
            }
            return null;
        }

        @Override
        public boolean keepsBurst() {
            return true;
        }
    }

    /** Nothing is published. */
    public record Blackout() implements StreamFault {
        @Override
        public String lossVerdict(StreamMemory memory, RandomGenerator random) {
            return "blackout";
        }
    }

    /** Values freeze at their last truth; seq and sourceTime advance. */
    public record FreezeValue() implements StreamFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.replace(Records.withValuesOf(d.record(), d.memory().frozenRecord(spec.id(), d.truth())));
        }
    }

    /** sourceTime stops at its value when the fault starts. */
    public record FreezeTimestamp() implements StreamFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.replace(Records.withSourceTime(d.record(), d.memory().frozenSourceTime(spec.id(), d.truth())));
        }
    }

    /** The last message again, byte for byte. */
    public record RepeatLast() implements StreamFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.repeatLastSent();
        }
    }

    /** Held back by a fixed delay plus uniform jitter . */
    public record Delay(double delayMs, double jitterMs) implements StreamFault {
        @Override
        public long delayMs(RandomGenerator random) {
            return Math.round(delayMs + random.nextDouble() * jitterMs);
        }
    }

    /** Some messages are held so that later ones overtake them. */
    public record Reorder(double reorderProbability, double holdMs) implements StreamFault {
        @Override
        public long delayMs(RandomGenerator random) {
            return random.nextDouble() < reorderProbability ? Math.round(holdMs) : 0;
        }
    }

    /** Published more than once . */
    public record Duplicate(double duplicateProbability, double copies) implements StreamFault {
        @Override
        public int extraCopies(RandomGenerator random) {
            return random.nextDouble() < duplicateProbability ? (int) Math.round(copies) : 0;
        }
    }

    /** The source clock is off by a fixed amount. */
    public record ClockOffset(double offsetMs) implements StreamFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.shiftClockMs(Math.round(offsetMs));
        }
    }

    /** The source clock drifts from the fault start on. */
    public record ClockDrift(double driftMsPerS) implements StreamFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.shiftClockMs(Math.round(driftMsPerS * d.activeForS()));
        }
    }
}
