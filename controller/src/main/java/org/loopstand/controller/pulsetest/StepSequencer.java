package org.loopstand.controller.pulsetest;

import java.util.ArrayList;
import java.util.List;
import org.loopstand.controller.pulsetest.plan.PlanSettings;
import org.loopstand.controller.pulsetest.programme.ProgrammeStep;
import org.loopstand.controller.pulsetest.programme.PulseProgramme;
import org.loopstand.controller.pulsetest.programme.TimedPulse;

/**
 * Walks the programme step by step on the test's clock. A step's pulses keep their planned offsets from
 * the step's start; a step ends at its planned window end only when the unit has settled there, else
 * when it settles or the settle timeout runs out. The next step starts then: its window never holds the
 * previous step's motion. Not thread-safe (the runner's agent thread only).
 */
final class StepSequencer {
    private final PulseProgramme programme;
    private final long settleTimeoutMs;
    private final List<StepTiming> timings = new ArrayList<>();
    private int step;
    private int pulseInStep;
    private long stepStartMs;

    /** @param programmeStartMs the programme's time zero (the lead-in runs from there), epoch ms */
    StepSequencer(PulseProgramme programme, long programmeStartMs, double settleTimeoutS) {
        this.programme = programme;
        this.settleTimeoutMs = Math.round(settleTimeoutS * 1000);
        this.stepStartMs = programme.steps().isEmpty() ? programmeStartMs
                : programmeStartMs + programme.steps().get(0).startOffsetMs();
    }

    /** @return the step under way, or null when all ran */
    ProgrammeStep current() {
        return step < programme.steps().size() ? programme.steps().get(step) : null;
    }

    /** @return the next pulse of the current step that is due at {@code nowMs}, or null; advances past it */
    TimedPulse nextDue(long nowMs) {
        ProgrammeStep s = current();
        if (s == null || pulseInStep >= s.pulses().size()) {
            return null;
        }
        TimedPulse p = s.pulses().get(pulseInStep);
        if (stepStartMs + (p.atOffsetMs() - s.startOffsetMs()) > nowMs) {
            return null;
        }
        pulseInStep++;
        return p;
    }

    /** @return the planned end of the current step's window, epoch ms */
    long nominalEndMs() {
        ProgrammeStep s = current();
        return s == null ? stepStartMs : stepStartMs + s.endOffsetMs() - s.startOffsetMs();
    }

    /** @return start of the current step's window, epoch ms */
    long stepStartMs() {
        return stepStartMs;
    }

    /**
     * Ends the current step when its window is over, all its pulses are out and the unit has settled
     * (or the wait timed out).
     *
     * @param settled whether the unit's own output is settled now
     * @return true when a step ended
     */
    boolean endStepIfDue(long nowMs, boolean settled) {
        ProgrammeStep s = current();
        if (s == null || pulseInStep < s.pulses().size() || nowMs < nominalEndMs()) {
            return false;
        }
        boolean holdStep = s.pulses().isEmpty();
        if (!holdStep && !settled && nowMs - nominalEndMs() < settleTimeoutMs) {
            return false;
        }
        timings.add(new StepTiming(s.index(), stepStartMs, nominalEndMs(), nowMs, holdStep || settled));
        step++;
        pulseInStep = 0;
        ProgrammeStep next = current();
        // keep any planned gap between steps (none in an expanded programme: steps are back to back)
        stepStartMs = next == null ? nowMs : nowMs + Math.max(0, next.startOffsetMs() - s.endOffsetMs());
        return true;
    }

    /**
     * @return the unit's own output has stayed within the step's settling band, without drifting more than
     *         the noise threshold, for {@code settledForS} up to now
     */
    static boolean settled(List<TelemetryPoint> telemetry, ProgrammeStep step, long nowMs, long nominalEndMs,
            PlanSettings s) {
        double band = Math.max(s.settleBandMinMw(), s.settleBandPct() / 100.0 * Math.abs(step.requestedChangeMw()));
        return Steadiness.over(telemetry, List.of(), nowMs, nominalEndMs - Math.round(s.settledForS() * 1000),
                s.settledForS(), band, s.noiseThresholdMw(), Double.NaN, 1).steady();
    }

    /** @return true once every step ran */
    boolean finished() {
        return current() == null;
    }

    /** @return 1-based number of the step under way (steps + 1 when all ran) */
    int stepNumber() {
        return step + 1;
    }

    List<StepTiming> timings() {
        return List.copyOf(timings);
    }
}
