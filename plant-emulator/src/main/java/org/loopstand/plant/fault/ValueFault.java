package org.loopstand.plant.fault;

import java.util.EnumSet;
import java.util.random.RandomGenerator;

import org.loopstand.protocol.message.Quality;
import org.loopstand.protocol.message.QualityFlag;
import org.loopstand.protocol.message.Validity;

/**
 * A value fault: a pure transform of one point of the outgoing record (see {@link ValueFaults}).
 * Frequencies are transformed in Hz with mHz parameters; scale and sign flip act on a frequency's
 * deviation from nominal.
 */
public interface ValueFault extends StreamFault {
    /**
     * @param v         the point's value (Hz for a frequency, MW otherwise)
     * @param hz        true for a frequency
     * @param nominalHz the area's nominal frequency, Hz
     * @return the value published
     */
    default double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
        return v;
    }

    /** @return the point's quality as published */
    default Quality quality(Quality q) {
        return q;
    }

    @Override
    default void shape(FaultSpec spec, MessageDraft d) {
        d.addValue(new ValueFaults.Applied(spec, d.activeForS(), d.memory().count(spec.id())));
    }

    /** A constant error. */
    record Bias(double offsetMw, double offsetMhz) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return hz ? v + offsetMhz / 1000.0 : v + offsetMw;
        }
    }

    /** An error that grows from the fault start on. */
    record Drift(double driftMwPerMin, double driftMhzPerMin) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return hz ? v + driftMhzPerMin / 1000.0 * a.activeForS() / 60.0 : v + driftMwPerMin * a.activeForS() / 60.0;
        }
    }

    /** Multiplied by a factor (a frequency: its deviation from nominal). */
    record Scale(double factor) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return hz ? nominalHz + (v - nominalHz) * factor : v * factor;
        }
    }

    /** The sign reversed (a frequency: its deviation from nominal). */
    record SignFlip() implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return hz ? nominalHz - (v - nominalHz) : -v;
        }
    }

    /** Extra Gaussian noise. */
    record Noise(double sigmaMw, double sigmaMhz) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return v + random.nextGaussian() * (hz ? sigmaMhz / 1000.0 : sigmaMw);
        }
    }

    /** A large error on the first messages of the window. */
    record Spike(double spikeMw, double spikeMhz, double spikeMessages) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return a.messageIndex() < spikeMessages ? v + (hz ? spikeMhz / 1000.0 : spikeMw) : v;
        }
    }

    /** Held at a fixed number, quality good. */
    record StuckAt(double valueMw, double valueHz) implements ValueFault {
        @Override
        public double value(double v, boolean hz, double nominalHz, ValueFaults.Applied a, RandomGenerator random) {
            return hz ? valueHz : valueMw;
        }
    }

    /** One point keeps the value it had when the fault started. */
    record HoldLast() implements ValueFault {
        @Override
        public void shape(FaultSpec spec, MessageDraft d) {
            d.addValue(new ValueFaults.Applied(spec, d.activeForS(), d.memory().count(spec.id()),
                    d.memory().frozenRecord(spec.id(), d.truth())));
        }
    }

    /** The point's quality replaced: validity, plus a detail flag unless {@code none}. */
    record QualityOverride(String validity, String flag) implements ValueFault {
        @Override
        public Quality quality(Quality q) {
            Validity v = validity.equals("questionable") ? Validity.QUESTIONABLE : Validity.INVALID;
            EnumSet<QualityFlag> flags = q.flags().isEmpty() ? EnumSet.noneOf(QualityFlag.class) : EnumSet.copyOf(q.flags());
            if (!flag.equals("none")) {
                for (QualityFlag qf : QualityFlag.values()) {
                    if (qf.wireName().equals(flag)) {
                        flags.add(qf);
                    }
                }
            }
            return new Quality(v, flags);
        }
    }
}
