package org.loopstand.controller.schedule;

/**
 * @param netInterchangeScheduledMw NIs, MW, + = export
 * @param frequencyScheduledHz      Fs, Hz
 */
public record AreaSchedule(double netInterchangeScheduledMw, double frequencyScheduledHz) {
}
