package org.loopstand.report.metrics;

import java.util.Optional;
import java.util.OptionalDouble;
import org.loopstand.report.model.TimeSeries;

/**
 * Frequency excursion after a disturbance and recovery times.
 *
 * @param nadirHz            lowest frequency at or after the disturbance, Hz
 * @param nadirTimeMs        when it occurred, epoch ms
 * @param zenithHz           highest frequency at or after the disturbance, Hz
 * @param zenithTimeMs       when it occurred, epoch ms
 * @param settlingTimeS      seconds from the disturbance until frequency enters the band around the
 *                           scheduled frequency and stays there to the end of the record; empty if it
 *                           never does
 */
public record FrequencyExcursion(double nadirHz, long nadirTimeMs, double zenithHz, long zenithTimeMs,
        OptionalDouble settlingTimeS) {

    /** Recovery period of NERC BAL-002 (from memory): ACE recovered within 15 minutes, s. */
    public static final double BAL002_RECOVERY_PERIOD_S = 900.0;

    /** Which way the disturbance pushed ACE. */
    public enum Direction {
        /** Loss of generation or import: ACE goes negative (NERC sign). */
        LOSS_OF_SUPPLY,
        /** Loss of load or export: ACE goes positive. */
        LOSS_OF_LOAD
    }

    /**
     * @param recoveryValueMw the ACE to return to, MW
     * @param recoveryTimeS   seconds from the disturbance until ACE first reached it; empty if never
     * @param passes          true when recovered within the recovery period
     */
    public record AceRecovery(double recoveryValueMw, OptionalDouble recoveryTimeS, boolean passes) {
    }

    /**
     * @param frequencyHz          frequency samples, Hz
     * @param disturbanceMs        time of the disturbance, epoch ms
     * @param scheduledFrequencyHz centre of the settling band, Hz
     * @param settlingBandHz       half width of the settling band, Hz, &gt; 0
     * @return the excursion; empty when no sample lies at or after the disturbance
     */
    public static Optional<FrequencyExcursion> of(TimeSeries frequencyHz, long disturbanceMs,
            double scheduledFrequencyHz, double settlingBandHz) {
        if (!(settlingBandHz > 0)) {
            throw new IllegalArgumentException("settlingBandHz must be positive, got " + settlingBandHz);
        }
        double nadir = Double.POSITIVE_INFINITY;
        double zenith = Double.NEGATIVE_INFINITY;
        long nadirT = -1;
        long zenithT = -1;
        for (int i = 0; i < frequencyHz.size(); i++) {
            double f = frequencyHz.value(i);
            if (frequencyHz.timeMs(i) < disturbanceMs || Double.isNaN(f)) {
                continue;
            }
            if (f < nadir) {
                nadir = f;
                nadirT = frequencyHz.timeMs(i);
            }
            if (f > zenith) {
                zenith = f;
                zenithT = frequencyHz.timeMs(i);
            }
        }
        if (nadirT < 0) {
            return Optional.empty();
        }
        return Optional.of(new FrequencyExcursion(nadir, nadirT, zenith, zenithT,
                settlingTimeS(frequencyHz, disturbanceMs, scheduledFrequencyHz, settlingBandHz)));
    }

    /**
     * Seconds from {@code fromMs} until the series enters [centre − band, centre + band] and stays there
     * for every later sample. Empty when the last sample is outside the band.
     */
    public static OptionalDouble settlingTimeS(TimeSeries series, long fromMs, double centre, double band) {
        long settledAt = -1;
        for (int i = 0; i < series.size(); i++) {
            long t = series.timeMs(i);
            double v = series.value(i);
            if (t < fromMs || Double.isNaN(v)) {
                continue;
            }
            if (Math.abs(v - centre) <= band) {
                if (settledAt < 0) {
                    settledAt = t;
                }
            } else {
                settledAt = -1;
            }
        }
        return settledAt < 0 ? OptionalDouble.empty() : OptionalDouble.of((settledAt - fromMs) / 1000.0);
    }

    /**
     * ACE recovery after a contingency in the manner of NERC BAL-002 (from memory): ACE must return to
     * at least zero, or to its pre-disturbance value when that was already on the disturbance's side
     * (negative for a loss of supply), within the recovery period.
     *
     * @param aceMw            ACE samples, MW (NERC sign)
     * @param disturbanceMs    time of the disturbance, epoch ms
     * @param preDisturbanceMw ACE just before the disturbance, MW
     * @param direction        which way the disturbance pushed ACE
     * @param recoveryPeriodS  allowed time, s (BAL-002: {@value #BAL002_RECOVERY_PERIOD_S})
     * @return the recovery
     */
    public static AceRecovery aceRecovery(TimeSeries aceMw, long disturbanceMs, double preDisturbanceMw,
            Direction direction, double recoveryPeriodS) {
        boolean supply = direction == Direction.LOSS_OF_SUPPLY;
        double target = supply ? Math.min(0.0, preDisturbanceMw) : Math.max(0.0, preDisturbanceMw);
        // Judge only after ACE has left the target: the first samples may still show the pre-disturbance value.
        boolean departed = false;
        for (int i = 0; i < aceMw.size(); i++) {
            long t = aceMw.timeMs(i);
            double a = aceMw.value(i);
            if (t < disturbanceMs || Double.isNaN(a)) {
                continue;
            }
            boolean recovered = supply ? a >= target : a <= target;
            if (!recovered) {
                departed = true;
            } else if (departed) {
                double s = (t - disturbanceMs) / 1000.0;
                return new AceRecovery(target, OptionalDouble.of(s), s <= recoveryPeriodS);
            }
        }
        return new AceRecovery(target, OptionalDouble.empty(), false);
    }
}
