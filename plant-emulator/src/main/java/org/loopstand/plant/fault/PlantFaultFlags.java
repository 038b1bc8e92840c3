package org.loopstand.plant.fault;

/**
 * Plant faults of one unit, as its plant interface reads them on every command and scan. The values
 * are live: they change when a fault starts or ends (read them each time, do not cache). Read on
 * the thread that drives the {@link FaultEngine}.
 */
public interface PlantFaultFlags {
    /** No fault: the unit behaves. */
    PlantFaultFlags NONE = new PlantFaultFlags() {
    };

    /** @return true: ack pulses as accepted but do not move the load reference */
    default boolean ignorePulses() {
        return false;
    }

    /** @return divisor of the pulse rate and ramp rate the unit actually achieves, ≥ 1 (1 = normal) */
    default double slowFactor() {
        return 1.0;
    }

    /** @return true: a raise pulse lowers and a lower pulse raises */
    default boolean swapRaiseLower() {
        return false;
    }

    /** @return true once a plant trip has been ordered: trip the unit (physics and status) and keep it tripped */
    default boolean tripRequested() {
        return false;
    }

    /** @return true: report control mode local and refuse commands with reason notInRemote */
    default boolean forcedLocal() {
        return false;
    }

    /** @return true: act on commands past validUntil (and ack them accepted) instead of refusing them expired */
    default boolean applyExpiredCommands() {
        return false;
    }
}
