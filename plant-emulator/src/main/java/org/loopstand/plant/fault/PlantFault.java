package org.loopstand.plant.fault;

/**
 * A fault of the unit plant interface: each says how it bends the interface's behaviour; the
 * interface reads the sum over the active ones through {@link PlantFaultFlags}.
 */
public interface PlantFault extends FaultBehaviour {
    default boolean ignoresPulses() {
        return false;
    }

    /** @return pulse rate and ramp rate are divided by this, ≥ 1 */
    default double slowFactor() {
        return 1.0;
    }

    default boolean swapsRaiseLower() {
        return false;
    }

    default boolean forcesLocal() {
        return false;
    }

    default boolean appliesExpiredCommands() {
        return false;
    }

    /** @return true when the unit trips at the fault start (the physics truth trips too) */
    default boolean tripsUnit() {
        return false;
    }

    /** The unit acts on commands even after validUntil. */
    record ApplyExpired() implements PlantFault {
        @Override
        public boolean appliesExpiredCommands() {
            return true;
        }
    }

    /** The unit acks pulses but its load reference does not move. */
    record IgnorePulses() implements PlantFault {
        @Override
        public boolean ignoresPulses() {
            return true;
        }
    }

    /** The unit follows its commands slowly. */
    record SlowResponse(double slowFactor) implements PlantFault {
    }

    /** Raise and lower are swapped in the unit's wiring. */
    record SwapRaiseLower() implements PlantFault {
        @Override
        public boolean swapsRaiseLower() {
            return true;
        }
    }

    /** The unit trips at the fault start. */
    record PlantTrip() implements PlantFault {
        @Override
        public boolean tripsUnit() {
            return true;
        }
    }

    /** The unit goes to local control. */
    record SwitchToLocal() implements PlantFault {
        @Override
        public boolean forcesLocal() {
            return true;
        }
    }
}
