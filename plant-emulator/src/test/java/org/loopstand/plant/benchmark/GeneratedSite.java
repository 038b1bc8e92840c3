package org.loopstand.plant.benchmark;

import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.grid.GridBuilder;
import org.loopstand.plant.grid.UnitSpec;

/**
 * A large invented site for the benchmark: areas on a ring with chords every fifth area (a mesh), equal
 * units of the three turbine types in turn, one load per area, balanced at the start.
 */
final class GeneratedSite {
    private GeneratedSite() {
    }

    static Grid build(int areaCount, int unitsPerArea, double noiseSigmaMw, double rateLimitMwPerMin) {
        return build(areaCount, unitsPerArea, noiseSigmaMw, rateLimitMwPerMin, false);
    }

    /**
     * @param allDifferent each unit gets its own governor time constant (+0.1 % per unit of its area) and droop
     *                     (4–6 %), so no two units share a block: the case where grouping equal units saves nothing
     */
    static Grid build(int areaCount, int unitsPerArea, double noiseSigmaMw, double rateLimitMwPerMin, boolean allDifferent) {
        GridBuilder b = new GridBuilder("generated-" + areaCount + "x" + unitsPerArea);
        double unitRatingMw = 150;
        double unitOutputMw = 100;
        for (int a = 0; a < areaCount; a++) {
            String area = "area-" + a;
            double loadMw = unitsPerArea * unitOutputMw;
            b.area(area).nominalFrequencyHz(50).ratingMva(2 * loadMw).inertiaS(5).dampingMwPerHz(loadMw / 50)
                    .kMwPerHz(unitsPerArea * unitRatingMw / 0.05 / 50);
            for (int u = 0; u < unitsPerArea; u++) {
                double spread = allDifferent ? (double) u / unitsPerArea : 0.5;
                UnitSpec unit = b.unit(area + "-unit-" + u, area).ratingMw(unitRatingMw).droopPct(4 + 2 * spread)
                        .minOutputMw(30).maxOutputMw(unitRatingMw).initialOutputMw(unitOutputMw)
                        .raiseRateMwPerMin(rateLimitMwPerMin).lowerRateMwPerMin(rateLimitMwPerMin);
                double slower = allDifferent ? 1 + 0.001 * u : 1;
                switch (u % 3) {
                    case 0 -> unit.reheat(0.3, 7, 0.3).governorTimeConstantS(0.2 * slower);
                    case 1 -> unit.nonReheat(0.4).governorTimeConstantS(0.2 * slower);
                    default -> unit.hydro(2, 43, 9).governorTimeConstantS(0.5 * slower);
                }
            }
            b.load(area + "-load", area).baseMw(loadMw).noise(noiseSigmaMw, 60);
        }
        for (int a = 0; a < areaCount; a++) {
            b.tie("ring-" + a, "area-" + a, "area-" + ((a + 1) % areaCount)).synchronizingMwPerRad(400);
            if (a % 5 == 0 && areaCount > 10) {
                b.tie("chord-" + a, "area-" + a, "area-" + ((a + areaCount / 2) % areaCount)).synchronizingMwPerRad(200);
            }
        }
        return b.build();
    }
}
