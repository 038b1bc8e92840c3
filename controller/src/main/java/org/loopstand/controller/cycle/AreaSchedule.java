package org.loopstand.controller.cycle;

/**
 * @param netInterchangeScheduledMw NIs, MW, + = export
 * @param frequencyScheduledHz      Fs, Hz
 */
public record AreaSchedule(double netInterchangeScheduledMw, double frequencyScheduledHz) {
}
