package org.loopstand.plant.physics;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.loopstand.plant.grid.Grid;

/**
 * Each area's power balance at t = 0 of a run: units' initial output, the loads at the scenario's start
 * hour and the ties' scheduled flows. An area out of balance starts with a disturbance the scenario does not
 * name: its frequency moves from the first step. Beyond {@link #tolerance} that is a warning with the
 * figures (a scenario may start at an hour its site was not balanced for); beyond {@value #REFUSED_SHARE} of
 * the area's larger side (a site without loads starts with all its generation in surplus) every verdict
 * would judge the file, not the controller, and runs refuse it. A disturbance at t = 0 is an event.
 *
 * @param hourOfDay the start hour the loads were taken at, h, [0, 24)
 * @param areas     per area, in site order
 */
public record StartBalance(double hourOfDay, List<Area> areas) {
    /** Share of an area's larger side (generation or load) allowed out of balance, on top of {@link #FLOOR_MW}. */
    public static final double TOLERANCE_SHARE = 0.005;
    /** Imbalance always allowed, MW (rounding in hand-written files). */
    public static final double FLOOR_MW = 1.0;
    /** Share of an area's larger side beyond which a run is refused (common practice, no source). */
    public static final double REFUSED_SHARE = 0.5;

    /**
     * @param generationMw      units' initial mechanical output, MW
     * @param loadMw            loads at the start hour (no noise yet), MW
     * @param scheduledExportMw net scheduled tie flow out of the area, MW, + = export
     */
    public record Area(String id, double generationMw, double loadMw, double scheduledExportMw) {
        /** @return generation − load − scheduled export, MW: what the frequency would start to climb on */
        public double imbalanceMw() {
            return generationMw - loadMw - scheduledExportMw;
        }

        /** @return the imbalance allowed: {@value #FLOOR_MW} MW + {@value #TOLERANCE_SHARE} of the larger side, MW */
        public double toleranceMw() {
            return FLOOR_MW + TOLERANCE_SHARE * Math.max(Math.abs(generationMw), Math.abs(loadMw));
        }

        public boolean balanced() {
            return Math.abs(imbalanceMw()) <= toleranceMw();
        }

        /** @return true when the imbalance exceeds {@value #REFUSED_SHARE} of the larger side and the tolerance */
        public boolean refused() {
            return !balanced() && Math.abs(imbalanceMw()) > REFUSED_SHARE * Math.max(Math.abs(generationMw), Math.abs(loadMw));
        }
    }

    /** @param hourOfDay the scenario's start hour, h, [0, 24) */
    public static StartBalance of(Grid grid, double hourOfDay) {
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 0L, hourOfDay);
        List<Area> out = new ArrayList<>();
        for (int a = 0; a < grid.areas().size(); a++) {
            out.add(new Area(grid.areas().get(a).id(), sim.generationMw(a), sim.loadMw(a), sim.netInterchangeMw(a)));
        }
        return new StartBalance(hourOfDay, List.copyOf(out));
    }

    /** @return one sentence per area so far out of balance that runs refuse it, empty when none is */
    public List<String> problems() {
        return areas.stream().filter(Area::refused).map(a -> describe(a, "runs refuse a start so far out of balance. Give"
                + " the area loads (site loads:, baseMw and dailyShapePu) or units' initialOutputMw that balance at"
                + " startHourOfDay; a disturbance at t = 0 is an event")).toList();
    }

    /** @return one sentence per area out of balance beyond its tolerance but not refused */
    public List<String> warnings() {
        return areas.stream().filter(a -> !a.balanced() && !a.refused()).map(a -> describe(a, "the run starts with this"
                + " disturbance (docs/physics.md, \"Start balance\")")).toList();
    }

    private String describe(Area a, String consequence) {
        return String.format(Locale.ROOT, "area %s starts out of balance at hour %.2f: generation %.1f MW − load %.1f MW"
                + " − scheduled export %.1f MW = %+.1f MW (allowed ±%.1f MW), its frequency moves from the first step; %s",
                a.id(), hourOfDay, a.generationMw(), a.loadMw(), a.scheduledExportMw(), a.imbalanceMw(), a.toleranceMw(),
                consequence);
    }
}
