package org.loopstand.app.campaign;

import java.util.List;
import java.util.Map;
import java.util.function.UnaryOperator;

/**
 * One run of a campaign as drawn: its random seed and the faults and load events added to the base scenario.
 *
 * @param index  1-based run number in the campaign
 * @param seed   the random seed written into the run's scenario (load noise, fault draws inside the plant)
 * @param faults drawn faults, in draw order
 * @param loads  drawn load events, in draw order
 */
public record RunPlan(int index, long seed, List<PlannedFault> faults, List<PlannedLoad> loads) {
    public RunPlan {
        faults = List.copyOf(faults);
        loads = List.copyOf(loads);
    }

    /**
     * A drawn fault, as it goes into the run's scenario file.
     *
     * @param id         fault id in the scenario (campaign-1, campaign-2, …)
     * @param type       fault type
     * @param target     its one target
     * @param parameters drawn parameters (Double or String); absent ones take the type's default
     * @param startS     window start, scenario s
     * @param endS       window end, scenario s
     */
    public record PlannedFault(String id, String type, String target, Map<String, Object> parameters, double startS, double endS) {
        public PlannedFault {
            parameters = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(parameters));
        }

        public double lengthS() {
            return endS - startS;
        }

        public PlannedFault window(double start, double end) {
            return new PlannedFault(id, type, target, parameters, start, end);
        }

        /** @return e.g. {@code commandDelay on ridge-hydro-1 [120, 300) s {delayMs=8000}} */
        public String describe() {
            return type + " on " + target + " [" + Distribution.format(startS) + ", " + Distribution.format(endS) + ") s"
                    + (parameters.isEmpty() ? "" : " " + parameters);
        }
    }

    /**
     * A drawn load event.
     *
     * @param type      loadStep or loadRamp
     * @param area      area id
     * @param atS       when, scenario s
     * @param deltaMw   load change, MW
     * @param durationS ramp length, s (NaN for a step)
     */
    public record PlannedLoad(String type, String area, double atS, double deltaMw, double durationS) {
        public String describe() {
            return type + " " + Distribution.format(deltaMw) + " MW in " + area + " at " + Distribution.format(atS) + " s"
                    + (Double.isNaN(durationS) ? "" : " over " + Distribution.format(durationS) + " s");
        }
    }

    public RunPlan withFaults(List<PlannedFault> v) {
        return new RunPlan(index, seed, v, loads);
    }

    public RunPlan withLoads(List<PlannedLoad> v) {
        return new RunPlan(index, seed, faults, v);
    }

    /** @return this plan with fault {@code i} replaced */
    public RunPlan withFault(int i, UnaryOperator<PlannedFault> change) {
        List<PlannedFault> list = new java.util.ArrayList<>(faults);
        list.set(i, change.apply(list.get(i)));
        return withFaults(list);
    }

    /** @return every drawn fault and load event, one line each */
    public List<String> describe() {
        List<String> out = new java.util.ArrayList<>();
        faults.forEach(f -> out.add(f.describe()));
        loads.forEach(l -> out.add(l.describe()));
        return out;
    }
}
