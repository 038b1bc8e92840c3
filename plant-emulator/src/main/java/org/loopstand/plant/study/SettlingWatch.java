package org.loopstand.plant.study;

import java.util.Arrays;
import java.util.Locale;

import org.loopstand.plant.physics.GridSimulator;

/**
 * Decides whether a study run settled: over the last {@link #WINDOW_S} s of the run (the last half when the
 * run is shorter than twice that), every area's frequency stays within a band of {@link #FREQUENCY_BAND_HZ}
 * (max − min) and every tie flow within {@link #TIE_BAND_MW}. A growing or sustained oscillation, or a drift
 * still under way, breaks a band; load noise of a few MW does not (common practice, no source).
 */
final class SettlingWatch {
    static final double WINDOW_S = 30.0;
    static final double FREQUENCY_BAND_HZ = 0.02;
    static final double TIE_BAND_MW = 10.0;

    private final double windowStartS;
    private final double[] minHz;
    private final double[] maxHz;
    private final double[] minMw;
    private final double[] maxMw;

    SettlingWatch(int areaCount, int tieCount, double durationS) {
        this.windowStartS = durationS - Math.min(WINDOW_S, durationS / 2);
        minHz = filled(areaCount, Double.POSITIVE_INFINITY);
        maxHz = filled(areaCount, Double.NEGATIVE_INFINITY);
        minMw = filled(tieCount, Double.POSITIVE_INFINITY);
        maxMw = filled(tieCount, Double.NEGATIVE_INFINITY);
    }

    /** Takes the simulator's state after a step. */
    void observe(GridSimulator sim) {
        if (sim.timeS() < windowStartS - 1e-9) {
            return;
        }
        for (int a = 0; a < minHz.length; a++) {
            double f = sim.frequencyHz(a);
            minHz[a] = Math.min(minHz[a], f);
            maxHz[a] = Math.max(maxHz[a], f);
        }
        for (int t = 0; t < minMw.length; t++) {
            double p = sim.tieFlowMw(t);
            minMw[t] = Math.min(minMw[t], p);
            maxMw[t] = Math.max(maxMw[t], p);
        }
    }

    boolean settled() {
        for (int a = 0; a < minHz.length; a++) {
            if (!(maxHz[a] - minHz[a] <= FREQUENCY_BAND_HZ)) {
                return false;
            }
        }
        for (int t = 0; t < minMw.length; t++) {
            if (!(maxMw[t] - minMw[t] <= TIE_BAND_MW)) {
                return false;
            }
        }
        return true;
    }

    String criterion(double durationS) {
        return String.format(Locale.ROOT, "every area's frequency within a %s Hz band and every tie flow within a %s MW"
                        + " band (max - min) over the last %s s", DecimalText.of(FREQUENCY_BAND_HZ),
                DecimalText.of(TIE_BAND_MW), DecimalText.of(durationS - windowStartS));
    }

    private static double[] filled(int n, double v) {
        double[] a = new double[n];
        Arrays.fill(a, v);
        return a;
    }
}
