package org.loopstand.plant.grid;

/**
 * A synchronous tie between two areas, linearised about its scheduled operating point:
 * {@code dP/dt = 2π·T·(Δf_from − Δf_to)}. Flow is positive from {@code fromArea} to {@code toArea}.
 *
 * @param synchronizingMwPerRad T, MW per radian of angle difference, &gt; 0
 * @param scheduledFlowMw       flow at the start of a run, MW, + = from → to
 */
public record TieLine(String id, String fromArea, String toArea, double synchronizingMwPerRad,
                      double scheduledFlowMw) {
}
