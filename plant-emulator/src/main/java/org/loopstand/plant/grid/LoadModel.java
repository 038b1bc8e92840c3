package org.loopstand.plant.grid;

import java.util.List;

/**
 * One aggregate load of an area: {@code P(t, Δf) = (baseMw·shape(t) + noise(t))·(1 + k·Δf/f0)}.
 *
 * @param baseMw                          level at shape factor 1, MW, ≥ 0
 * @param dailyShapePu                    24 hourly factors (linear in between, wrapping at midnight), or empty for a flat load
 * @param noiseSigmaMw                    standard deviation of the Ornstein–Uhlenbeck noise, MW, ≥ 0
 * @param noiseTauS                       correlation time of the noise, s, &gt; 0 when sigma &gt; 0
 * @param frequencySensitivityPctPerPct   k: percent load change per percent frequency change, ≥ 0
 */
public record LoadModel(String id, String area, double baseMw, List<Double> dailyShapePu,
                        double noiseSigmaMw, double noiseTauS, double frequencySensitivityPctPerPct) {

    public LoadModel {
        dailyShapePu = List.copyOf(dailyShapePu);
    }

    /** @return the shape factor at {@code hourOfDay} (any real number; wraps every 24 h). */
    public double shapeFactor(double hourOfDay) {
        if (dailyShapePu.isEmpty()) {
            return 1.0;
        }
        double h = hourOfDay % 24.0;
        if (h < 0) {
            h += 24.0;
        }
        int i = (int) Math.floor(h);
        double frac = h - i;
        double a = dailyShapePu.get(i % 24);
        double b = dailyShapePu.get((i + 1) % 24);
        return a + (b - a) * frac;
    }
}
