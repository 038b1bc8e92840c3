package org.loopstand.plant.scenario;

import java.util.Comparator;
import java.util.List;

import org.loopstand.plant.physics.Integrator;

/**
 * A study run: which site, how long, which seed, and timed events (sorted by time, file order kept
 * for equal times).
 *
 * @param siteId          the site the scenario is written for
 * @param durationS       simulated duration, s, &gt; 0
 * @param seed            seeds the load noise
 * @param startHourOfDay  time of day at t = 0 for the daily load shapes, h, in [0, 24)
 * @param traceIntervalS  interval between trace rows, s, a multiple of the step
 * @param stepS           integration step, s; NaN = the site's default
 * @param integrator      how each step is taken (file key {@code integrator: rk4|exact}, default rk4)
 */
public record Scenario(String siteId, double durationS, long seed, double startHourOfDay, double traceIntervalS,
                       double stepS, Integrator integrator, List<ScenarioEvent> events) {
    public Scenario {
        events = events.stream().sorted(Comparator.comparingDouble(ScenarioEvent::atS)).toList();
    }

    public Scenario withDurationS(double v) {
        return new Scenario(siteId, v, seed, startHourOfDay, traceIntervalS, stepS, integrator, events);
    }

    public Scenario withSeed(long v) {
        return new Scenario(siteId, durationS, v, startHourOfDay, traceIntervalS, stepS, integrator, events);
    }

    public Scenario withIntegrator(Integrator v) {
        return new Scenario(siteId, durationS, seed, startHourOfDay, traceIntervalS, stepS, v, events);
    }

    public Scenario withTraceIntervalS(double v) {
        return new Scenario(siteId, durationS, seed, startHourOfDay, v, stepS, integrator, events);
    }
}
