package org.loopstand.controller.config;

import org.loopstand.protocol.site.AceConvention;

/**
 * What the controller needs of one area.
 *
 * @param id                 area id
 * @param convention         NORTH_AMERICAN (bias B, MW/0.1 Hz, negative) or EUROPEAN (K, MW/Hz, positive)
 * @param bias               B or K as written in the file, in the convention's unit
 * @param nominalFrequencyHz f0, Hz
 */
public record SiteArea(String id, AceConvention convention, double bias, double nominalFrequencyHz) {
}
