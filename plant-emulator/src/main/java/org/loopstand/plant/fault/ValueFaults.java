package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;

import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.TieFlow;
import org.loopstand.protocol.message.UnitTelemetry;

/**
 * Value faults as pure transforms of one outgoing record: the truth record is never changed, a new
 * record is returned. Frequencies are transformed in Hz with mHz parameters; scale and sign flip act
 * on a frequency's deviation from nominal (a frequency of −50 Hz would not be a meter fault but nonsense).
 */
public final class ValueFaults {
    private ValueFaults() {
    }

    /**
     * One value fault at one moment.
     *
     * @param spec         the fault
     * @param activeForS   seconds since it started, for drift
     * @param messageIndex messages of this stream it has acted on before this one (0 = first), for spike
     * @param heldRecord   for holdLast: the truth record of this stream when the fault started
     *                     (its point's value is published instead); null otherwise
     */
    public record Applied(FaultSpec spec, double activeForS, int messageIndex, Object heldRecord) {
        /** A fault that holds no record. */
        public Applied(FaultSpec spec, double activeForS, int messageIndex) {
            this(spec, activeForS, messageIndex, null);
        }
    }

    /** @return the meter record as published with {@code faults} applied in order */
    public static AreaMeter apply(AreaMeter m, List<Applied> faults, double nominalHz, RandomGenerator random) {
        double f = m.frequencyHz();
        Quality fq = m.frequencyQuality();
        double ni = m.netInterchangeMw();
        Quality nq = m.netInterchangeQuality();
        List<TieFlow> ties = new ArrayList<>(m.ties());
        for (Applied a : faults) {
            String point = a.spec().point();
            AreaMeter held = a.heldRecord() instanceof AreaMeter h ? h : null;
            if (FaultLibrary.POINT_FREQUENCY.equals(point)) {
                f = held != null ? held.frequencyHz() : value(a, f, true, nominalHz, random);
                fq = quality(a, fq);
            } else if (FaultLibrary.POINT_NET_INTERCHANGE.equals(point)) {
                ni = held != null ? held.netInterchangeMw() : value(a, ni, false, nominalHz, random);
                nq = quality(a, nq);
            } else {
                for (int i = 0; i < ties.size(); i++) {
                    TieFlow t = ties.get(i);
                    if (t.tie().equals(point)) {
                        double v = held != null ? heldTie(held, point, t.flowMw())
                                : value(a, t.flowMw(), false, nominalHz, random);
                        ties.set(i, new TieFlow(t.tie(), v, quality(a, t.quality())));
                    }
                }
            }
        }
        return new AreaMeter(m.seq(), m.sourceTime(), m.area(), m.meter(), f, fq, ties, ni, nq);
    }

    private static double heldTie(AreaMeter held, String tie, double live) {
        for (TieFlow t : held.ties()) {
            if (t.tie().equals(tie)) {
                return t.flowMw();
            }
        }
        return live;
    }

    /** @return the telemetry as published with {@code faults} applied to outputMw and its quality */
    public static UnitTelemetry apply(UnitTelemetry t, List<Applied> faults, RandomGenerator random) {
        double out = t.outputMw();
        Quality q = t.outputQuality();
        for (Applied a : faults) {
            out = a.heldRecord() instanceof UnitTelemetry held ? held.outputMw() : value(a, out, false, 0, random);
            q = quality(a, q);
        }
        return new UnitTelemetry(t.seq(), t.sourceTime(), t.unit(), out, q, t.setpointMw(), t.status(), t.controlMode(),
                t.regulatingMinMw(), t.regulatingMaxMw(), t.rampMwPerMin(), t.pulseRateMwPerMin(), t.acceptsSetpoints(),
                t.lastCommandSeq());
    }

    /**
     * @param hz        true for a frequency (Hz, mHz parameters), false for a MW point
     * @param nominalHz the area's nominal frequency, for scale and sign flip of a frequency
     */
    static double value(Applied a, double v, boolean hz, double nominalHz, RandomGenerator random) {
        return a.spec().behaviour() instanceof ValueFault f ? f.value(v, hz, nominalHz, a, random) : v;
    }

    static Quality quality(Applied a, Quality q) {
        return a.spec().behaviour() instanceof ValueFault f ? f.quality(q) : q;
    }
}
