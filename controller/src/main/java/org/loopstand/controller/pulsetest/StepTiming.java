package org.loopstand.controller.pulsetest;

/**
 * When a programme step actually ran: a step ends only once the unit has settled (or the wait timed out),
 * so the next step's answer never includes this step's motion.
 *
 * @param index        programme step index
 * @param startMs      window start, epoch ms on the test's clock
 * @param nominalEndMs end of the planned window, epoch ms
 * @param endMs        actual end, ≥ nominalEndMs, epoch ms
 * @param settled      true when the unit had settled at endMs; false when the wait timed out
 */
public record StepTiming(int index, long startMs, long nominalEndMs, long endMs, boolean settled) {
    /** @return how long the step waited beyond its planned window for the unit to settle, s */
    public double settleWaitS() {
        return (endMs - nominalEndMs) / 1000.0;
    }
}
