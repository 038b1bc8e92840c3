package org.loopstand.controller.pulsetest;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/** The unit's telemetry scan period as received. Pure. */
final class ScanPeriod {
    private ScanPeriod() {
    }

    /** @return median interval of the last (up to 21) good readings, ms; {@code fallbackMs} until three intervals are known */
    static long medianMs(List<TelemetryPoint> telemetry, long fallbackMs) {
        List<Long> times = new ArrayList<>();
        for (int i = telemetry.size() - 1; i >= 0 && times.size() < 21; i--) {
            if (telemetry.get(i).good()) {
                times.add(telemetry.get(i).tMs());
            }
        }
        if (times.size() < 4) {
            return fallbackMs;
        }
        long[] d = new long[times.size() - 1];
        for (int i = 0; i + 1 < times.size(); i++) {
            d[i] = times.get(i) - times.get(i + 1);
        }
        Arrays.sort(d);
        return Math.max(1, d[d.length / 2]);
    }
}
