package org.loopstand.plant.check;

import org.loopstand.protocol.site.AceConvention;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.TieLine;

/**
 * ACE computed from the physics truth of a run (not what any controller computed), in the area's own
 * convention: European {@code ACE = ΔP + K·Δf}, North-American {@code ACE = ΔNI − 10B·Δf}; the
 * schedule is the ties' scheduled flows and the nominal frequency, or the area's schedule in force
 * from a scheduleChange event ({@link RunRecord#scheduleAt}).
 */
public final class TruthAce {
    private TruthAce() {
    }

    /** @return the area's truth ACE at every truth sample, MW */
    public static RunRecord.Series of(RunRecord run, Grid grid, String areaId) {
        Area area = grid.areas().get(grid.areaIndex(areaId));
        RunRecord.Series f = run.series("frequencyHz/" + areaId);
        RunRecord.Series ni = run.series("netInterchangeMw/" + areaId);
        double scheduledNi = scheduledNetInterchangeMw(grid, areaId);
        RunRecord.Series out = new RunRecord.Series();
        for (int i = 0; i < Math.min(f.size(), ni.size()); i++) {
            RunRecord.ScheduleRecord in = run.scheduleAt(areaId, f.timeS(i));
            double df = f.value(i) - (in == null ? area.nominalFrequencyHz() : in.scheduledFrequencyHz());
            double dp = ni.value(i) - (in == null ? scheduledNi : in.scheduledNetInterchangeMw());
            out.add(f.timeS(i), area.aceConvention() == AceConvention.EUROPEAN ? dp + area.kMwPerHz() * df
                    : dp - 10 * area.biasMwPer01Hz() * df);
        }
        return out;
    }

    /** @return the area's scheduled net interchange from its ties' scheduled flows, MW, + = export */
    public static double scheduledNetInterchangeMw(Grid grid, String area) {
        double sum = 0;
        for (TieLine t : grid.ties()) {
            if (t.fromArea().equals(area)) {
                sum += t.scheduledFlowMw();
            } else if (t.toArea().equals(area)) {
                sum -= t.scheduledFlowMw();
            }
        }
        return sum;
    }
}
