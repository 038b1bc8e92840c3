package org.loopstand.plant.fault;

import java.util.random.RandomGenerator;

/**
 * A fault of the command stage ({@link CommandFaultStage}): a command is dropped, held back or
 * duplicated. A method draws from {@code random} only when its fault needs a draw.
 */
public interface CommandFault extends FaultBehaviour {
    /** @return true when this command is lost */
    default boolean drops(RandomGenerator random) {
        return false;
    }

    /** @return extra hold-back of this command, ms, ≥ 0 */
    default long delayMs(RandomGenerator random) {
        return 0;
    }

    /** @return extra copies of this command, ≥ 0 */
    default int extraCopies(RandomGenerator random) {
        return 0;
    }

    /** Commands are lost on the way in. */
    record Drop(double dropProbability) implements CommandFault {
        @Override
        public boolean drops(RandomGenerator random) {
            return random.nextDouble() < dropProbability;
        }
    }

    /** Commands reach the unit late: a fixed delay plus uniform jitter. */
    record Delay(double delayMs, double jitterMs) implements CommandFault {
        @Override
        public long delayMs(RandomGenerator random) {
            return Math.round(delayMs + random.nextDouble() * jitterMs);
        }
    }

    /** Commands reach the unit more than once. */
    record Duplicate(double duplicateProbability, double copies) implements CommandFault {
        @Override
        public int extraCopies(RandomGenerator random) {
            return random.nextDouble() < duplicateProbability ? (int) Math.round(copies) : 0;
        }
    }
}
