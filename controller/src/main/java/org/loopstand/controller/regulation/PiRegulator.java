package org.loopstand.controller.regulation;

/**
 * Positional PI on ACE giving the area regulation level, MW relative to the units' base points.
 * The sign is reversed: positive ACE (over-generation) gives a negative (lower) request.
 * <pre>
 *   e = −ACE
 *   I_n = I_(n−1) + (cycleS / integralTimeS)·e     (only if allowed, see below)
 *   u = clamp(kp·e + I, lowMw, highMw)
 * </pre>
 * Anti-wind-up: conditional integration (no integration while the output is at a limit and the
 * error pushes further into it) plus clamping of I itself to [lowMw, highMw]. {@link #freeze()}
 * stops integration (suspended control); {@link #track(double, double)} sets I so that the output
 * equals the present regulation level for a bumpless resume.
 */
public final class PiRegulator {
    private final double kp;
    private final double integralTimeS;
    private final double cycleS;
    private double integratorMw;
    private double integratorBeforeStepMw;
    private boolean frozen;
    private boolean saturated;

    /**
     * @param kp            proportional gain, MW/MW, ≥ 0
     * @param integralTimeS integral time, s, &gt; 0 (integral gain per cycle = cycleS/integralTimeS)
     * @param cycleS        control cycle, s, &gt; 0
     */
    public PiRegulator(double kp, double integralTimeS, double cycleS) {
        if (!(kp >= 0) || !Double.isFinite(kp)) {
            throw new IllegalArgumentException("kp must be >= 0, was " + kp);
        }
        if (!(integralTimeS > 0) || !Double.isFinite(integralTimeS)) {
            throw new IllegalArgumentException("integralTimeS must be > 0, was " + integralTimeS);
        }
        if (!(cycleS > 0) || !Double.isFinite(cycleS)) {
            throw new IllegalArgumentException("cycleS must be > 0, was " + cycleS);
        }
        this.kp = kp;
        this.integralTimeS = integralTimeS;
        this.cycleS = cycleS;
    }

    /**
     * One cycle.
     *
     * @param aceMw  (filtered) ACE, MW
     * @param lowMw  lowest regulation level the units can reach now, MW (≤ 0 normally)
     * @param highMw highest regulation level the units can reach now, MW (≥ lowMw)
     * @return regulation level, MW, positive = raise
     */
    public double step(double aceMw, double lowMw, double highMw) {
        if (!Double.isFinite(aceMw)) {
            throw new IllegalArgumentException("aceMw must be finite, was " + aceMw);
        }
        if (!(lowMw <= highMw)) {
            throw new IllegalArgumentException("lowMw (" + lowMw + ") must be <= highMw (" + highMw + ")");
        }
        double e = -aceMw;
        integratorBeforeStepMw = integratorMw;
        if (!frozen) {
            double candidate = integratorMw + cycleS / integralTimeS * e;
            double unclamped = kp * e + candidate;
            boolean pushesUp = e > 0 && unclamped > highMw;
            boolean pushesDown = e < 0 && unclamped < lowMw;
            if (!pushesUp && !pushesDown) {
                integratorMw = candidate;
            }
        }
        integratorMw = Math.max(lowMw, Math.min(highMw, integratorMw));
        double raw = kp * e + integratorMw;
        double out = Math.max(lowMw, Math.min(highMw, raw));
        saturated = out != raw || out == lowMw || out == highMw;
        return out;
    }

    /** Stop integrating (control suspended or quiet band). Output still follows the P part. */
    public void freeze() {
        frozen = true;
    }

    /** Integrate again. */
    public void unfreeze() {
        frozen = false;
    }

    public boolean frozen() {
        return frozen;
    }

    /** @return true when the last output was at lowMw or highMw */
    public boolean saturated() {
        return saturated;
    }

    /** Integrator to zero. */
    public void reset() {
        integratorMw = 0;
        integratorBeforeStepMw = 0;
        saturated = false;
    }

    /**
     * Bumpless transfer: set I so that {@code kp·(−aceMw) + I = currentLevelMw}.
     *
     * @param currentLevelMw regulation level the units are at now, MW
     * @param aceMw          ACE the next step will see, MW
     */
    public void track(double currentLevelMw, double aceMw) {
        integratorMw = currentLevelMw - kp * (-aceMw);
        integratorBeforeStepMw = integratorMw;
    }

    /**
     * Take back the integration of the last {@link #step}: the integrator keeps what it had
     * accumulated before it, nothing of that is lost. Used when the units could not follow this
     * cycle's level because of their ramp (conditional integration against the ramp).
     */
    public void withholdLastIntegration() {
        integratorMw = integratorBeforeStepMw;
    }

    /** Move the integrator by {@code deltaMw}, e.g. when tertiary re-dispatch moves base points. */
    public void shiftIntegrator(double deltaMw) {
        integratorMw += deltaMw;
        integratorBeforeStepMw += deltaMw;
    }

    public double integratorMw() {
        return integratorMw;
    }
}
