package org.loopstand.plant.grid;

import org.loopstand.protocol.site.AceConvention;

/**
 * A control area lumped into one inertia: {@code M dΔf/dt = ΣPm − Pload − D·Δf − ΣPtie,out} with
 * {@code M = 2·H·S/f0}.
 *
 * @param id                   unique name
 * @param nominalFrequencyHz   50 or 60
 * @param ratingMva            S, the base the inertia constant is given on, &gt; 0
 * @param inertiaS             H on {@code ratingMva}, seconds, &gt; 0
 * @param dampingMwPerHz       load damping D, MW/Hz, ≥ 0 (loads may add their own frequency dependence)
 * @param aceConvention        which ACE formula the controller uses for this area
 * @param biasMwPer01Hz        frequency bias setting B, MW/0.1 Hz, negative (North-American); NaN if unset
 * @param kMwPerHz             K factor, MW/Hz, positive (European); NaN if unset
 */
public record Area(String id, double nominalFrequencyHz, double ratingMva, double inertiaS,
                   double dampingMwPerHz, AceConvention aceConvention, double biasMwPer01Hz,
                   double kMwPerHz) {

    /** @return M = 2·H·S/f0 in MW·s/Hz. */
    public double inertiaMwSPerHz() {
        return 2.0 * inertiaS * ratingMva / nominalFrequencyHz;
    }
}
