package org.loopstand.plant.field;

import org.loopstand.protocol.message.UnitStatus;

/**
 * The plant interface's view of its turbine: what it can read from the unit and the one thing it
 * writes, the governor's load reference. Implemented directly on the simulator (same process) or over
 * the {@code field/unit/{unit}/…} topics (plant interface in another process).
 */
public interface TurbineField {
    /** @return false until the field has given a first reading (a remote field before its first message) */
    boolean ready();

    /** @return electrical output, MW */
    double outputMw();

    /** @return load reference in effect at the turbine, MW */
    double loadReferenceMw();

    /**
     * @return scenario epoch ms of the turbine state the readings ({@link #outputMw()}, {@link #loadReferenceMw()},
     *         {@link #status()}) come from: the physics' time, older than the clock's now while the physics
     *         lags it (or, for a field in another process, by the reading's way over the bus); meaningful
     *         once {@link #ready()}
     */
    long readingTimeMs();

    /** @return online, offline or tripped */
    UnitStatus status();

    /**
     * Asks the turbine to take a new load reference.
     *
     * @param mw load reference, MW (the physics holds it inside the unit's output range)
     */
    void writeLoadReferenceMw(double mw);
}
