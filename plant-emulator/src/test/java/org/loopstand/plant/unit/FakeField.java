package org.loopstand.plant.unit;

import org.loopstand.plant.field.TurbineField;
import org.loopstand.protocol.message.UnitStatus;

/** A turbine stand-in: output follows the reference with a first-order lag of {@code lagS}, stepped by hand. */
final class FakeField implements TurbineField {
    double referenceMw;
    double outputMw;
    UnitStatus status = UnitStatus.ONLINE;
    boolean ready = true;
    int writes;
    /** source time of the readings, epoch ms (the test's clock, unless a test makes the field lag) */
    java.util.function.LongSupplier readingTimeMs;

    FakeField(double mw, java.util.function.LongSupplier readingTimeMs) {
        this.readingTimeMs = readingTimeMs;
        referenceMw = mw;
        outputMw = mw;
    }

    /** Moves output toward the reference for dtS with time constant 1 s. */
    void settle(double dtS) {
        outputMw += (referenceMw - outputMw) * (1 - Math.exp(-dtS));
    }

    @Override public boolean ready() { return ready; }
    @Override public double outputMw() { return outputMw; }
    @Override public double loadReferenceMw() { return referenceMw; }
    @Override public long readingTimeMs() { return readingTimeMs.getAsLong(); }
    @Override public UnitStatus status() { return status; }

    @Override
    public void writeLoadReferenceMw(double mw) {
        referenceMw = mw;
        writes++;
    }
}
