package org.loopstand.controller.pulsetest.safety;

/** Asked by the runner on every work cycle whether the operator wants to stop. */
@FunctionalInterface
public interface AbortSwitch {
    /** @return true once the operator asked to stop (stays true) */
    boolean abortRequested();

    /** A switch that is never pressed. */
    AbortSwitch NEVER = () -> false;
}
