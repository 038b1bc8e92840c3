package org.loopstand.plant.runtime;

import java.util.function.Supplier;

import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.time.Clock;

/** Compiles the physics before scenario time starts, on a simulator thrown away afterwards. */
public final class PhysicsWarmUp {
    private PhysicsWarmUp() {
    }

    /**
     * Steps a throwaway simulator so that the JIT has compiled the physics before scenario time
     * starts (the first wall seconds of an accelerated run otherwise run the physics interpreted).
     *
     * @param sims         makes a simulator of the same site and step (not the one the run uses)
     * @param wall         wall clock for the budget
     * @param maxSteps     steps at most
     * @param maxWallNanos wall time at most, ns
     * @return steps run
     */
    public static long run(Supplier<GridSimulator> sims, Clock wall, long maxSteps, long maxWallNanos) {
        long start = wall.monotonicNanos();
        GridSimulator sim = sims.get();
        long steps = 0;
        while (steps < maxSteps && (steps % 1_000 != 0 || wall.monotonicNanos() - start < maxWallNanos)) {
            sim.step();
            steps++;
        }
        return steps;
    }
}
