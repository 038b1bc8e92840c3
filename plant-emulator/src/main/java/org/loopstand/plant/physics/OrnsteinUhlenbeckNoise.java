package org.loopstand.plant.physics;

import java.util.SplittableRandom;

/**
 * Mean-reverting load noise {@code dx = −x/τ·dt + σ·√(2/τ)·dW}, stationary standard deviation σ,
 * advanced with its exact discretisation {@code x' = x·e^(−h/τ) + σ·√(1 − e^(−2h/τ))·N(0,1)} so the
 * statistics do not depend on the step. Gaussian draws use the polar method with StrictMath so a seed
 * gives the same sequence on every JVM.
 */
final class OrnsteinUhlenbeckNoise {
    private final SplittableRandom random;
    private final double decay;
    private final double kick;
    private double valueMw;
    private double spare = Double.NaN;

    OrnsteinUhlenbeckNoise(SplittableRandom random, double sigmaMw, double tauS, double stepS) {
        this.random = random;
        this.decay = sigmaMw > 0 ? StrictMath.exp(-stepS / tauS) : 0.0;
        this.kick = sigmaMw > 0 ? sigmaMw * Math.sqrt(1.0 - StrictMath.exp(-2.0 * stepS / tauS)) : 0.0;
    }

    double valueMw() {
        return valueMw;
    }

    void advance() {
        if (kick != 0.0) {
            valueMw = valueMw * decay + kick * nextGaussian();
        }
    }

    private double nextGaussian() {
        if (!Double.isNaN(spare)) {
            double s = spare;
            spare = Double.NaN;
            return s;
        }
        double u;
        double v;
        double s;
        do {
            u = 2.0 * random.nextDouble() - 1.0;
            v = 2.0 * random.nextDouble() - 1.0;
            s = u * u + v * v;
        } while (s >= 1.0 || s == 0.0);
        double factor = Math.sqrt(-2.0 * StrictMath.log(s) / s);
        spare = v * factor;
        return u * factor;
    }
}
