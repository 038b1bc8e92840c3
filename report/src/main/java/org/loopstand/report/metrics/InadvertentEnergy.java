package org.loopstand.report.metrics;

import org.loopstand.report.model.TimeSeries;

/**
 * Inadvertent interchange energy {@code ∫ (NIa − NIs) dt}, by the trapezoid rule over the actual net
 * interchange samples, with the schedule held at its last value (zero-order hold) at each sample time.
 * Positive = more exported than scheduled. On/off-peak accounts are not kept.
 *
 * @param netMwh       ∫ (NIa − NIs) dt, MWh
 * @param overMwh      sum of the sample intervals whose trapezoid is positive, MWh (≥ 0)
 * @param underMwh     sum of the sample intervals whose trapezoid is negative, MWh (≤ 0)
 * @param durationS    time covered, s
 */
public record InadvertentEnergy(double netMwh, double overMwh, double underMwh, double durationS) {

    /**
     * @param netInterchangeActualMw    NIa samples, MW (+ = export)
     * @param netInterchangeScheduledMw NIs, MW, as a step schedule
     * @return the energy; a pair with a NaN end is skipped
     */
    public static InadvertentEnergy of(TimeSeries netInterchangeActualMw, TimeSeries netInterchangeScheduledMw) {
        double net = 0;
        double over = 0;
        double under = 0;
        double duration = 0;
        for (int i = 0; i + 1 < netInterchangeActualMw.size(); i++) {
            long t0 = netInterchangeActualMw.timeMs(i);
            long t1 = netInterchangeActualMw.timeMs(i + 1);
            double d0 = netInterchangeActualMw.value(i) - netInterchangeScheduledMw.valueAt(t0);
            double d1 = netInterchangeActualMw.value(i + 1) - netInterchangeScheduledMw.valueAt(t1);
            if (Double.isNaN(d0) || Double.isNaN(d1)) {
                continue;
            }
            double hours = (t1 - t0) / 3_600_000.0;
            double e = (d0 + d1) / 2.0 * hours;
            net += e;
            if (e >= 0) {
                over += e;
            } else {
                under += e;
            }
            duration += (t1 - t0) / 1000.0;
        }
        return new InadvertentEnergy(net, over, under, duration);
    }
}
