package org.loopstand.plant.unit;

import org.loopstand.protocol.message.PulseDirection;

/**
 * Moves a unit's load reference toward a target at a set rate. A raise/lower pulse of d ms moves the
 * target by pulseRateMwPerMin × d / 60000 MW and the reference follows at the pulse rate, so the
 * change is spread over the pulse's own duration (as a pulse receiver integrating the pulse would).
 * A setpoint moves the target to the setpoint and the reference follows at the ramp rate. Targets are
 * held inside the regulating range. Pulses add to the current target: two raise pulses of 2 s move
 * the reference as far as one of 4 s.
 */
public final class LoadReferenceMotion {
    private final UnitSettings settings;
    private double referenceMw;
    private double targetMw;
    private double rateMwPerMin;

    /** @param initialMw starting reference, MW (taken as is, even outside the regulating range) */
    public LoadReferenceMotion(UnitSettings settings, double initialMw) {
        this.settings = settings;
        reset(initialMw);
    }

    /** Stops any motion and takes {@code mw} as the reference (e.g. after a trip or a field restart). */
    public void reset(double mw) {
        referenceMw = mw;
        targetMw = mw;
        rateMwPerMin = settings.rampMwPerMin();
    }

    /** Stops where it is. */
    public void hold() {
        targetMw = referenceMw;
    }

    /**
     * @return MW the target can still move in that direction before the regulating limit (≥ 0)
     */
    public double headroomMw(PulseDirection direction) {
        return direction == PulseDirection.RAISE
                ? Math.max(0, settings.regulatingMaxMw() - targetMw)
                : Math.max(0, targetMw - settings.regulatingMinMw());
    }

    /**
     * Starts a pulse.
     *
     * @return the target change actually taken, MW (signed; smaller than asked when clamped)
     */
    public double pulse(PulseDirection direction, long durationMs) {
        double askedMw = settings.pulseRateMwPerMin() * durationMs / 60_000.0;
        double sign = direction == PulseDirection.RAISE ? 1 : -1;
        double before = targetMw;
        targetMw = settings.clampMw(targetMw + sign * askedMw);
        rateMwPerMin = settings.pulseRateMwPerMin();
        return targetMw - before;
    }

    /** Starts a move to {@code mw} (held in the regulating range) at the ramp rate; @return the target taken, MW */
    public double setpoint(double mw) {
        targetMw = settings.clampMw(mw);
        rateMwPerMin = settings.rampMwPerMin();
        return targetMw;
    }

    /** Moves the reference toward the target for {@code dtNanos} of scenario time; @return the new reference, MW */
    public double advance(long dtNanos) {
        double maxStepMw = rateMwPerMin * dtNanos / 60e9;
        double gap = targetMw - referenceMw;
        if (Math.abs(gap) <= maxStepMw) {
            referenceMw = targetMw;
        } else {
            referenceMw += Math.signum(gap) * maxStepMw;
        }
        return referenceMw;
    }

    public double referenceMw() {
        return referenceMw;
    }

    public double targetMw() {
        return targetMw;
    }

    public boolean moving() {
        return referenceMw != targetMw;
    }
}
