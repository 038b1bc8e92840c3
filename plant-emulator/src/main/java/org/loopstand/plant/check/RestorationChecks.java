package org.loopstand.plant.check;

import java.util.function.IntToDoubleFunction;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;

/** Checks that a quantity of the physics truth came back to schedule in time after a moment. */
final class RestorationChecks {
    private RestorationChecks() {
    }

    /**
     * Frequency back within ±bandMhz of schedule and staying there, within withinS of afterS. The
     * schedule is the nominal frequency, or the scheduled frequency of a scheduleChange in force.
     */
    static CheckOutcome frequencyRestored(CheckSpec spec, RunRecord run, Grid grid) {
        Area area = grid.areas().get(grid.areaIndex(spec.text("area")));
        RunRecord.Series f = run.series("frequencyHz/" + area.id());
        double bandHz = spec.number("bandMhz") / 1000.0;
        java.util.function.IntToDoubleFunction scheduled = i -> {
            RunRecord.ScheduleRecord in = run.scheduleAt(area.id(), f.timeS(i));
            return in == null ? area.nominalFrequencyHz() : in.scheduledFrequencyHz();
        };
        String target = run.schedules().stream().anyMatch(r -> r.area().equals(area.id())) ? "its schedule"
                : CheckOutcome.format(area.nominalFrequencyHz()) + " Hz";
        return staysBack(spec, f, i -> Math.abs(f.value(i) - scheduled.applyAsDouble(i)) > bandHz,
                "frequency of " + area.id() + " within ±" + CheckOutcome.format(spec.number("bandMhz")) + " mHz of " + target,
                i -> Math.abs(f.value(i) - scheduled.applyAsDouble(i)) * 1000, "mHz");
    }

    /** Tie flow back within ±bandMw of its schedule and staying there, within withinS of afterS. */
    static CheckOutcome tieFlowRestored(CheckSpec spec, RunRecord run, Grid grid) {
        TieLine tie = grid.ties().get(grid.tieIndex(spec.text("tie")));
        RunRecord.Series p = run.series("tieFlowMw/" + tie.id());
        double band = spec.number("bandMw");
        return staysBack(spec, p, i -> Math.abs(p.value(i) - tie.scheduledFlowMw()) > band,
                "flow on " + tie.id() + " within ±" + CheckOutcome.format(band) + " MW of " + CheckOutcome.format(tie.scheduledFlowMw())
                        + " MW", i -> Math.abs(p.value(i) - tie.scheduledFlowMw()), "MW");
    }

    /**
     * BAL-002-style disturbance recovery (NERC BAL-002, from memory): after the disturbance ACE must come
     * back to zero, or to its pre-disturbance value if that was negative, within 15 minutes. Here ACE is
     * the truth ACE from the physics (not what the controller computed).
     */
    static CheckOutcome aceRecovered(CheckSpec spec, RunRecord run, Grid grid) {
        String areaId = spec.text("area");
        RunRecord.Series f = TruthAce.of(run, grid, areaId);
        IntToDoubleFunction ace = f::value;
        double after = spec.number("afterS");
        double within = spec.number("withinS");
        double tol = spec.number("toleranceMw");
        double pre = 0;
        int first = -1;
        for (int i = 0; i < f.size(); i++) {
            if (f.timeS(i) < after) {
                pre = ace.applyAsDouble(i);
            } else if (first < 0) {
                first = i;
            }
        }
        if (first < 0) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, "no truth samples after " + after + " s", false);
        }
        double target = Math.min(0, pre) - tol;
        int dipped = -1;
        for (int i = first; i < f.size() && dipped < 0; i++) {
            if (ace.applyAsDouble(i) < target) {
                dipped = i;
            }
        }
        String what = "truth ACE of " + areaId + " back to " + CheckOutcome.format(Math.min(0, pre)) + " MW (tolerance "
                + CheckOutcome.format(tol) + " MW)";
        if (dipped < 0) {
            return new CheckOutcome(spec.name(), true, 0, "s", within, what + ": ACE never fell below it after "
                    + CheckOutcome.format(after) + " s", false);
        }
        for (int i = dipped; i < f.size(); i++) {
            if (ace.applyAsDouble(i) >= target) {
                double delay = f.timeS(i) - after;
                return new CheckOutcome(spec.name(), delay <= within, delay, "s", within,
                        what + " at " + CheckOutcome.format(f.timeS(i)) + " s", false);
            }
        }
        return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, what + ": not recovered by the end ("
                + CheckOutcome.format(run.endS()) + " s), ACE then " + CheckOutcome.format(ace.applyAsDouble(f.size() - 1)) + " MW", false);
    }

    private interface Out {
        boolean at(int i);
    }

    /**
     * Time from afterS to the moment the quantity is back in band for good: to the end of the run, or,
     * with holdS, for holdS in a row (a return into the band that lasts is the restoration; a later
     * excursion, e.g. on load noise, is reported in the detail but does not undo it). Never back = fail.
     */
    private static CheckOutcome staysBack(CheckSpec spec, RunRecord.Series s, Out out, String what, IntToDoubleFunction deviation,
            String devUnit) {
        double after = spec.number("afterS");
        double within = spec.number("withinS");
        double holdS = spec.number("holdS"); // NaN when not set
        int first = -1;
        double worst = 0;
        for (int i = 0; i < s.size(); i++) {
            if (s.timeS(i) >= after) {
                first = first < 0 ? i : first;
                worst = Math.max(worst, deviation.applyAsDouble(i));
            }
        }
        if (first < 0) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, "no truth samples after " + after + " s", false);
        }
        int back = backIndex(s, out, first, holdS);
        if (back < 0) {
            int last = s.size() - 1;
            return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, what + ": not back by the end ("
                    + CheckOutcome.format(s.timeS(last)) + " s), deviation then " + CheckOutcome.format(deviation.applyAsDouble(last))
                    + " " + devUnit + ", worst " + CheckOutcome.format(worst) + " " + devUnit, false);
        }
        double backAt = back == first ? after : s.timeS(back);
        double delay = backAt - after;
        String held = Double.isNaN(holdS) ? " on" : " on for " + CheckOutcome.format(holdS) + " s" + laterExcursion(s, out, back, holdS,
                deviation, devUnit);
        return new CheckOutcome(spec.name(), delay <= within, delay, "s", within,
                what + " from " + CheckOutcome.format(backAt) + " s" + held + "; worst deviation after " + CheckOutcome.format(after)
                        + " s: " + CheckOutcome.format(worst) + " " + devUnit, false);
    }

    /** First sample from which the series stays in band for holdS (NaN: to the end), or stays in band to the end; -1 if none. */
    private static int backIndex(RunRecord.Series s, Out out, int first, double holdS) {
        int runStart = -1;
        for (int i = first; i < s.size(); i++) {
            if (out.at(i)) {
                runStart = -1;
                continue;
            }
            runStart = runStart < 0 ? i : runStart;
            if (!Double.isNaN(holdS) && s.timeS(i) - s.timeS(runStart) >= holdS) {
                return runStart;
            }
        }
        return runStart; // in band from runStart to the last sample (or -1: out at the end)
    }

    /** The detail's note on samples out of band after the hold: from when, how many, the worst deviation. */
    private static String laterExcursion(RunRecord.Series s, Out out, int back, double holdS, IntToDoubleFunction deviation,
            String devUnit) {
        int outSamples = 0;
        double worst = 0;
        double firstOutS = Double.NaN;
        for (int i = back; i < s.size(); i++) {
            if (s.timeS(i) - s.timeS(back) > holdS && out.at(i)) {
                outSamples++;
                worst = Math.max(worst, deviation.applyAsDouble(i));
                firstOutS = Double.isNaN(firstOutS) ? s.timeS(i) : firstOutS;
            }
        }
        return outSamples == 0 ? "" : " (out of band again from " + CheckOutcome.format(firstOutS) + " s, " + outSamples
                + " truth samples, worst " + CheckOutcome.format(worst) + " " + devUnit + ")";
    }
}
