package org.loopstand.plant.scenario;

import java.util.List;

import org.loopstand.plant.check.CheckSpec;
import org.loopstand.plant.fault.FaultSpec;

/**
 * A scenario with everything a rehearsal needs beyond the physics: the run's rate, timed fault
 * windows and the checks that must hold.
 *
 * @param scenario the physics part (site, duration, seed, events)
 * @param rateX    how many scenario seconds pass per wall second in a live run, &gt; 0 (study mode ignores it)
 * @param faults   fault windows, in file order
 * @param checks   checks, in file order, names unique
 */
public record RunScenario(Scenario scenario, double rateX, List<FaultSpec> faults, List<CheckSpec> checks) {
    public RunScenario {
        faults = List.copyOf(faults);
        checks = List.copyOf(checks);
    }
}
