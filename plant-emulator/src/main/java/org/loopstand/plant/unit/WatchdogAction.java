package org.loopstand.plant.unit;

/** What a unit does with its load reference when the controller's heartbeat is lost. */
public enum WatchdogAction {
    /** Keep the load reference where it is (a pulse or setpoint in progress stops where it is). */
    HOLD,
    /** Move to the configured base point at the unit's ramp rate. */
    BASE_POINT
}
