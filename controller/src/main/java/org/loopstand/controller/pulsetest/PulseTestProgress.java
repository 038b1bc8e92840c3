package org.loopstand.controller.pulsetest;

import java.util.Locale;
import org.loopstand.controller.pulsetest.programme.ProgrammeStep;

/**
 * Where a running test stands, for the terminal (immutable snapshot).
 *
 * @param state       run state
 * @param step        label of the step under way, or what the test is doing (e.g. waiting for a steady unit)
 * @param stepNumber  1-based number of the step under way, 0 before the first
 * @param stepCount   number of steps in the programme, 0 before it is expanded
 * @param elapsedS    since the test started, s
 * @param outputMw    last measured output, MW (NaN before any)
 * @param ownMw       last output less the governor's expected answer, MW (NaN before any)
 * @param referenceMw the unit's load reference as it reports it, MW (NaN before any)
 * @param requestedMw what the pulses sent so far ask for, MW (NaN before the programme starts)
 */
public record PulseTestProgress(RunState state, String step, int stepNumber, int stepCount, double elapsedS,
        double outputMw, double ownMw, double referenceMw, double requestedMw) {

    /**
     * @param current      step under way, or null
     * @param waitingSettle the step's window is over and it waits for the unit to settle
     * @param last         last telemetry reading, or null
     */
    static PulseTestProgress of(RunState state, ProgrammeStep current, boolean waitingSettle, int stepNumber,
            int stepCount, double elapsedS, TelemetryPoint last, double requestedMw) {
        String what = switch (state) {
            case AWAITING_TELEMETRY -> "waiting for telemetry";
            case AWAITING_STEADY -> "waiting for a steady unit";
            case RUNNING -> current == null ? "finishing" : current.label() + (waitingSettle ? " (waiting to settle)" : "");
            default -> state.name().toLowerCase(Locale.ROOT);
        };
        return new PulseTestProgress(state, what, Math.min(stepNumber, stepCount), stepCount, elapsedS,
                last == null ? Double.NaN : last.outputMw(), last == null ? Double.NaN : last.ownMw(),
                last == null ? Double.NaN : last.setpointMw(), requestedMw);
    }
}
