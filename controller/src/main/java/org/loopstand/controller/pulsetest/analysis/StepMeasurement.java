package org.loopstand.controller.pulsetest.analysis;

/**
 * Figures measured for one step; NaN where a figure cannot be computed (see docs/pulse-test.md).
 *
 * @param baselineMw         mean output over the averaging window before the step, MW
 * @param finalMw            mean output over the averaging window at the end of the step, MW
 * @param measuredChangeMw   finalMw − baselineMw, MW, signed
 * @param requestedChangeMw  what the pulses asked for, MW, signed
 * @param firstMovementS     first sample beyond the noise threshold (in the commanded direction) after the
 *                           first pulse, s
 * @param deadTimeS          dead time: where the 10–90 % ramp fit meets the baseline, less the first
 *                           pulse time, s (≥ 0); first movement when no fit is possible
 * @param rampMwPerMin       slope of a least-squares line over the 10–90 % part of the move, MW/min,
 *                           in the direction of the measured move (≥ 0)
 * @param gainMwPerPulseS    measured change in the commanded direction per pulse-second, MW/s (negative
 *                           when the unit moved the wrong way)
 * @param overshootPct       largest excursion beyond the final value, % of |measured change| (≥ 0)
 * @param settlingTimeS      from first pulse until the output stays within ±settling band of finalMw, s
 * @param finalErrorMw       finalMw − (baselineMw + requestedChangeMw), MW
 * @param peakExcursionMw    largest |output − baseline| in the window, MW
 * @param turnDelayS         reversal only: from the opposite pulses until the output turned, s
 * @param opposite           the net move went against the command by more than the noise threshold
 * @param samples            number of samples in the window
 */
public record StepMeasurement(double baselineMw, double finalMw, double measuredChangeMw, double requestedChangeMw,
        double firstMovementS, double deadTimeS, double rampMwPerMin, double gainMwPerPulseS, double overshootPct,
        double settlingTimeS, double finalErrorMw, double peakExcursionMw, double turnDelayS, boolean opposite,
        int samples) {
}
