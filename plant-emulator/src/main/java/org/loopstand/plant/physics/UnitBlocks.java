package org.loopstand.plant.physics;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The linear part of each unit's governor and turbine (state: valve, stage 1, stage 2; input: the governor
 * command, MW) as exact step propagators, one pair per distinct set of parameters so a site of many equal
 * units computes few exponentials:
 * <ul>
 * <li>free: the servo follows its target, {@code dx/dt = A·x + b·command};</li>
 * <li>valve held on a limit: the valve moves at a constant rate r (a rate limit, or 0 at a position limit) and the
 *     stages follow it; inputs are the command (hydro compensator only) and r.</li>
 * </ul>
 * The equations are those of {@link GridDynamics#derivatives}; {@code UnitBlocksTest} checks they agree.
 */
final class UnitBlocks {
    final BlockPropagator[] free;
    final BlockPropagator[] held;

    UnitBlocks(GridDynamics d, double stepS) {
        free = new BlockPropagator[d.unitCount];
        held = new BlockPropagator[d.unitCount];
        Map<List<Double>, BlockPropagator[]> cache = new HashMap<>();
        for (int u = 0; u < d.unitCount; u++) {
            List<Double> key = List.of((double) d.kind[u], d.invGovernorS[u], d.param1[u], d.param2[u], d.param3[u]);
            BlockPropagator[] pair = cache.computeIfAbsent(key, k -> build(d, k.get(0).intValue(), k.get(1), k.get(2),
                    k.get(3), k.get(4), stepS));
            free[u] = pair[0];
            held[u] = pair[1];
        }
    }

    private static BlockPropagator[] build(GridDynamics d, int kind, double g, double p1, double p2, double p3,
            double stepS) {
        double[][] a = new double[3][3];
        double[] b = new double[3];
        double[] out = new double[3];
        a[0][0] = -g;
        b[0] = g;
        a[1][0] = p1;
        a[1][1] = -p1;
        switch (kind) {
            case GridDynamics.NON_REHEAT -> out[1] = 1.0;
            case GridDynamics.REHEAT -> {
                a[2][1] = p2;
                a[2][2] = -p2;
                out[1] = p3;
                out[2] = 1.0 - p3;
            }
            default -> {
                // target = s2 + p3·(command − s2); without compensation p2 = 0 and p3 = 1, so the terms vanish
                a[0][2] = g * (1.0 - p3);
                b[0] = g * p3;
                a[2][2] = -p2;
                b[2] = p2;
                out[0] = -2.0;
                out[1] = 3.0;
            }
        }
        BlockPropagator free = new BlockPropagator(a, new double[][] {{b[0]}, {b[1]}, {b[2]}}, out, stepS);
        double[][] heldA = {new double[3], a[1].clone(), a[2].clone()};
        double[][] heldB = {{0.0, 1.0}, {b[1], 0.0}, {b[2], 0.0}};
        BlockPropagator held = new BlockPropagator(heldA, heldB, out, stepS);
        return new BlockPropagator[] {free, held};
    }
}
