package org.loopstand.plant.meter;

/**
 * One area meter: where it sits and how good it is.
 *
 * @param area                  area id
 * @param meter                 meter id (an area may have several, each on its own scan)
 * @param scanPeriodMs          scan period, ms, ≥ 10
 * @param frequencyNoiseSigmaHz standard deviation of the frequency measurement noise, Hz, ≥ 0
 * @param flowNoiseSigmaMw      standard deviation of each tie-flow measurement's noise, MW, ≥ 0
 * @param frequencyResolutionHz frequency transducer resolution, Hz, ≥ 0 (0 = none)
 * @param flowResolutionMw      tie-flow transducer resolution, MW, ≥ 0 (0 = none)
 */
public record MeterSettings(String area, String meter, long scanPeriodMs, double frequencyNoiseSigmaHz,
                            double flowNoiseSigmaMw, double frequencyResolutionHz, double flowResolutionMw) {
    /** Default scan period, ms. */
    public static final long DEFAULT_SCAN_MS = 2_000;

    public MeterSettings {
        if (scanPeriodMs < 10) {
            throw new IllegalArgumentException("meter " + area + "/" + meter + ": scanPeriodMs must be at least 10, got " + scanPeriodMs);
        }
        for (double v : new double[] {frequencyNoiseSigmaHz, flowNoiseSigmaMw, frequencyResolutionHz, flowResolutionMw}) {
            if (!(v >= 0) || Double.isInfinite(v)) {
                throw new IllegalArgumentException("meter " + area + "/" + meter
                        + ": noise and resolution must be finite and ≥ 0, got " + v);
            }
        }
    }

    /**
     * Meter {@code main} of an area: 2 s scan, 1 mHz noise and resolution, 0.5 MW flow noise, 0.1 MW
     * resolution (invented figures of a decent transducer; common practice, no source).
     */
    public static MeterSettings defaults(String area) {
        return new MeterSettings(area, "main", DEFAULT_SCAN_MS, 0.001, 0.5, 0.001, 0.1);
    }

    public MeterSettings withScanPeriodMs(long v) {
        return new MeterSettings(area, meter, v, frequencyNoiseSigmaHz, flowNoiseSigmaMw, frequencyResolutionHz, flowResolutionMw);
    }

    public MeterSettings withMeter(String id) {
        return new MeterSettings(area, id, scanPeriodMs, frequencyNoiseSigmaHz, flowNoiseSigmaMw, frequencyResolutionHz, flowResolutionMw);
    }

    public MeterSettings withNoise(double fHz, double flowMw) {
        return new MeterSettings(area, meter, scanPeriodMs, fHz, flowMw, frequencyResolutionHz, flowResolutionMw);
    }

    public MeterSettings withResolution(double fHz, double flowMw) {
        return new MeterSettings(area, meter, scanPeriodMs, frequencyNoiseSigmaHz, flowNoiseSigmaMw, fHz, flowMw);
    }
}
