package org.loopstand.controller.regulation;

/**
 * Filter, bands and PI of one area, in that order.
 *
 * <p>Quiet band: the regulation level is held (no change, integrator not moved) so no pulses go
 * out. Leaving the quiet band, the PI first tracks the held level, so the level does not jump.
 * Assist band: the PI keeps running; the allocation moves every available unit at full rate.
 * Not thread-safe: one instance per area, called from the cycle thread.
 */
public final class AreaRegulator {
    private final RegulationSettings settings;
    private final ExponentialSmoother filter;
    private final PiRegulator pi;
    private final AceBands bands;
    private double levelMw;
    private AceBand lastBand;

    public AreaRegulator(RegulationSettings settings) {
        this.settings = settings;
        this.filter = new ExponentialSmoother(settings.filterTimeConstantS(), settings.cycleS());
        this.pi = new PiRegulator(settings.kp(), settings.integralTimeS(), settings.cycleS());
        this.bands = settings.bands();
    }

    /**
     * @param aceMw  raw ACE this cycle, MW
     * @param lowMw  lowest reachable regulation level, MW
     * @param highMw highest reachable regulation level, MW
     */
    public RegulationResult step(double aceMw, double lowMw, double highMw) {
        double filtered = filter.update(aceMw);
        AceBand band = bands.classify(filtered);
        double previous = levelMw;
        if (band == AceBand.QUIET) {
            levelMw = Math.max(lowMw, Math.min(highMw, levelMw));
        } else {
            if (lastBand == AceBand.QUIET) {
                pi.track(levelMw, filtered);
            }
            levelMw = pi.step(filtered, lowMw, highMw);
        }
        lastBand = band;
        boolean saturated = levelMw <= lowMw || levelMw >= highMw;
        return new RegulationResult(filtered, band, levelMw, levelMw - previous, saturated);
    }

    /** Suspended: no integration, filter keeps running on whatever the caller still feeds. */
    public void suspend() {
        pi.freeze();
    }

    /**
     * Resume without a bump: the PI output starts at the level the units are at now.
     *
     * @param currentLevelMw sum over units of (setpoint − base point), MW
     * @param aceMw          latest ACE, MW; the filter restarts from it
     */
    public void resume(double currentLevelMw, double aceMw) {
        filter.reset();
        filter.update(aceMw);
        pi.unfreeze();
        pi.track(currentLevelMw, aceMw);
        levelMw = currentLevelMw;
        lastBand = null;
    }

    /**
     * Align the regulator with where the units actually are, without resetting the filter (used
     * after an assist-band cycle, where units moved at full rate rather than to the PI level).
     */
    public void trackLevel(double currentLevelMw, double aceMw) {
        pi.track(currentLevelMw, aceMw);
        levelMw = currentLevelMw;
    }

    /**
     * The units could not follow this cycle's level because of their ramp: keep the integrator
     * where it was before this cycle (conditional integration), without giving up what it holds.
     */
    public void withholdIntegration() {
        pi.withholdLastIntegration();
    }

    /** Base points moved by {@code deltaMw} in total: shift the level so the unit targets stay put. */
    public void onBasePointsMoved(double deltaMw) {
        pi.shiftIntegrator(-deltaMw);
        levelMw -= deltaMw;
    }

    public double levelMw() {
        return levelMw;
    }

    public boolean suspended() {
        return pi.frozen();
    }

    public RegulationSettings settings() {
        return settings;
    }

    PiRegulator pi() {
        return pi;
    }
}
