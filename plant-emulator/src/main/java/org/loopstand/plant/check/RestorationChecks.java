package org.loopstand.plant.check;

import java.util.function.IntToDoubleFunction;

import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;

/** Checks that a quantity of the physics truth came back to schedule in time after a moment. */
final class RestorationChecks {
    private RestorationChecks() {
    }

    /** Frequency back within ±bandMhz of schedule (nominal) and staying there, within withinS of afterS. */
    static CheckOutcome frequencyRestored(CheckSpec spec, RunRecord run, Grid grid) {
        Area area = grid.areas().get(grid.areaIndex(spec.text("area")));
        RunRecord.Series f = run.series("frequencyHz/" + area.id());
        double bandHz = spec.number("bandMhz") / 1000.0;
        return staysBack(spec, f, i -> Math.abs(f.value(i) - area.nominalFrequencyHz()) > bandHz,
                "frequency of " + area.id() + " within ±" + CheckOutcome.format(spec.number("bandMhz")) + " mHz of "
                        + CheckOutcome.format(area.nominalFrequencyHz()) + " Hz",
                i -> Math.abs(f.value(i) - area.nominalFrequencyHz()) * 1000, "mHz");
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

    /** Time from afterS to the sample after the last one out of band; never back = fail. */
    private static CheckOutcome staysBack(CheckSpec spec, RunRecord.Series s, Out out, String what, IntToDoubleFunction deviation,
            String devUnit) {
        double after = spec.number("afterS");
        double within = spec.number("withinS");
        int lastOut = -1;
        int samples = 0;
        double worst = 0;
        for (int i = 0; i < s.size(); i++) {
            if (s.timeS(i) < after) {
                continue;
            }
            samples++;
            worst = Math.max(worst, deviation.applyAsDouble(i));
            if (out.at(i)) {
                lastOut = i;
            }
        }
        if (samples == 0) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, "no truth samples after " + after + " s", false);
        }
        if (lastOut == s.size() - 1) {
            return new CheckOutcome(spec.name(), false, Double.NaN, "s", within, what + ": not back by the end ("
                    + CheckOutcome.format(s.timeS(lastOut)) + " s), deviation then " + CheckOutcome.format(deviation.applyAsDouble(lastOut))
                    + " " + devUnit + ", worst " + CheckOutcome.format(worst) + " " + devUnit, false);
        }
        double backAt = lastOut < 0 ? after : s.timeS(lastOut + 1);
        double delay = backAt - after;
        return new CheckOutcome(spec.name(), delay <= within, delay, "s", within,
                what + " from " + CheckOutcome.format(backAt) + " s on; worst deviation after " + CheckOutcome.format(after) + " s: "
                        + CheckOutcome.format(worst) + " " + devUnit, false);
    }
}
