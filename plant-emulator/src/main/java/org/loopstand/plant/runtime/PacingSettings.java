package org.loopstand.plant.runtime;

/**
 * The pace keeper's limits ({@link PlantPacing}), each checked against its range.
 *
 * @param lagS          scenario seconds the physics may fall behind the clock before the clock is held, &gt; 0
 * @param notKeptFactor asked rate / kept rate beyond which the run says RATE NOT KEPT, ≥ 1
 * @param slowFactor    rate multiplier at each slow-down, (0, 1)
 * @param calmWallS     wall seconds without lag before the rate is raised again, &gt; 0
 */
public record PacingSettings(double lagS, double notKeptFactor, double slowFactor, double calmWallS) {
    public PacingSettings {
        if (!(lagS > 0) || Double.isInfinite(lagS)) {
            throw new IllegalArgumentException("pace lag must be a positive number of scenario seconds, got " + lagS);
        }
        if (!(notKeptFactor >= 1) || Double.isInfinite(notKeptFactor)) {
            throw new IllegalArgumentException("pace factor must be at least 1, got " + notKeptFactor);
        }
        if (!(slowFactor > 0 && slowFactor < 1)) {
            throw new IllegalArgumentException("slow factor must be in (0, 1), got " + slowFactor);
        }
        if (!(calmWallS > 0) || Double.isInfinite(calmWallS)) {
            throw new IllegalArgumentException("calm time must be a positive number of wall seconds, got " + calmWallS);
        }
    }
}
