package org.loopstand.plant.fault;

import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.UnitTelemetry;

/** Copies of the two measurement records with one part replaced. */
final class Records {
    private Records() {
    }

    static long sourceTime(Object rec) {
        if (rec instanceof AreaMeter m) {
            return m.sourceTime();
        }
        return ((UnitTelemetry) rec).sourceTime();
    }

    static Object withSourceTime(Object rec, long sourceTime) {
        if (rec instanceof AreaMeter m) {
            return new AreaMeter(m.seq(), sourceTime, m.area(), m.meter(), m.frequencyHz(), m.frequencyQuality(), m.ties(),
                    m.netInterchangeMw(), m.netInterchangeQuality());
        }
        UnitTelemetry t = (UnitTelemetry) rec;
        return new UnitTelemetry(t.seq(), sourceTime, t.unit(), t.outputMw(), t.outputQuality(), t.setpointMw(), t.status(),
                t.controlMode(), t.regulatingMinMw(), t.regulatingMaxMw(), t.rampMwPerMin(), t.pulseRateMwPerMin(),
                t.acceptsSetpoints(), t.lastCommandSeq());
    }

    /** @return {@code snapshot}'s values with {@code rec}'s seq and sourceTime (a frozen value, live header) */
    static Object withValuesOf(Object rec, Object snapshot) {
        if (rec instanceof AreaMeter m) {
            AreaMeter s = (AreaMeter) snapshot;
            return new AreaMeter(m.seq(), m.sourceTime(), m.area(), m.meter(), s.frequencyHz(), s.frequencyQuality(), s.ties(),
                    s.netInterchangeMw(), s.netInterchangeQuality());
        }
        UnitTelemetry t = (UnitTelemetry) rec;
        UnitTelemetry s = (UnitTelemetry) snapshot;
        return new UnitTelemetry(t.seq(), t.sourceTime(), t.unit(), s.outputMw(), s.outputQuality(), s.setpointMw(), s.status(),
                s.controlMode(), s.regulatingMinMw(), s.regulatingMaxMw(), s.rampMwPerMin(), s.pulseRateMwPerMin(),
                s.acceptsSetpoints(), t.lastCommandSeq());
    }
}
