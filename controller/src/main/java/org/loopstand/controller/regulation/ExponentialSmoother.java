package org.loopstand.controller.regulation;

/**
 * First-order low-pass filter sampled once per cycle:
 * {@code y_n = y_(n−1) + α·(x_n − y_(n−1))}, {@code α = 1 − exp(−cycleS / timeConstantS)}.
 * A time constant of 0 passes the input through. The first sample initialises the output.
 */
public final class ExponentialSmoother {
    private final double alpha;
    private boolean primed;
    private double outputValue;

    /**
     * @param timeConstantS filter time constant, s, ≥ 0 (0 = no filtering)
     * @param cycleS        sampling period, s, &gt; 0
     */
    public ExponentialSmoother(double timeConstantS, double cycleS) {
        if (!(timeConstantS >= 0) || !Double.isFinite(timeConstantS)) {
            throw new IllegalArgumentException("timeConstantS must be >= 0, was " + timeConstantS);
        }
        if (!(cycleS > 0) || !Double.isFinite(cycleS)) {
            throw new IllegalArgumentException("cycleS must be > 0, was " + cycleS);
        }
        this.alpha = timeConstantS == 0 ? 1.0 : 1.0 - Math.exp(-cycleS / timeConstantS);
    }

    /** @return the filtered value after taking {@code x} */
    public double update(double x) {
        if (!Double.isFinite(x)) {
            throw new IllegalArgumentException("filter input must be finite, was " + x);
        }
        if (!primed) {
            outputValue = x;
            primed = true;
        } else {
            outputValue += alpha * (x - outputValue);
        }
        return outputValue;
    }

    /** Forget history; the next sample initialises the output. */
    public void reset() {
        primed = false;
        outputValue = 0;
    }

    public double alpha() {
        return alpha;
    }

    public double value() {
        return outputValue;
    }
}
