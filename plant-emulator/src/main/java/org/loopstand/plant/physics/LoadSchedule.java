package org.loopstand.plant.physics;

import java.util.ArrayList;
import java.util.List;

/**
 * Load changes ordered by events, per area, on top of the loads' own profiles: steps (immediate) and
 * ramps (linear over a duration). Frequency independent. Finished ramps fold into a constant so the
 * list does not grow over a long run.
 */
final class LoadSchedule {
    private final double[] settledMw;
    private final List<List<double[]>> rampsByArea = new ArrayList<>();

    LoadSchedule(int areaCount) {
        settledMw = new double[areaCount];
        for (int a = 0; a < areaCount; a++) {
            rampsByArea.add(new ArrayList<>());
        }
    }

    void step(int area, double deltaMw) {
        settledMw[area] += deltaMw;
    }

    void ramp(int area, double startS, double durationS, double deltaMw) {
        if (durationS <= 0) {
            step(area, deltaMw);
        } else {
            rampsByArea.get(area).add(new double[] {startS, durationS, deltaMw});
        }
    }

    /** @return the event-driven load change of {@code area} at {@code timeS}, MW */
    double offsetMw(int area, double timeS) {
        double sum = settledMw[area];
        List<double[]> ramps = rampsByArea.get(area);
        for (int i = 0, n = ramps.size(); i < n; i++) {
            double[] r = ramps.get(i);
            double progress = (timeS - r[0]) / r[1];
            if (progress > 0) {
                sum += r[2] * Math.min(1.0, progress);
            }
        }
        return sum;
    }

    /** Folds ramps that are complete at {@code timeS} into the settled level. */
    void settle(double timeS) {
        for (int a = 0; a < settledMw.length; a++) {
            List<double[]> ramps = rampsByArea.get(a);
            for (int i = ramps.size() - 1; i >= 0; i--) {
                double[] r = ramps.get(i);
                if (timeS >= r[0] + r[1]) {
                    settledMw[a] += r[2];
                    ramps.remove(i);
                }
            }
        }
    }
}
