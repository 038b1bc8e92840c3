package org.loopstand.controller.pulsetest.plan;

/**
 * Safety caps of a plan; the test refuses to start when the expanded programme exceeds them and stops
 * when the measured output or the elapsed time does.
 *
 * @param maxExcursionMw largest distance from the starting output the programme may request, MW, &gt; 0
 * @param maxDurationS   longest the whole test may take, s, &gt; 0
 */
public record PlanLimits(double maxExcursionMw, double maxDurationS) {
}
