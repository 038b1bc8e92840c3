package org.loopstand.controller.pulsetest;

/** Where a pulse test run stands. */
public enum RunState {
    /** Waiting for the unit's first good telemetry. */
    AWAITING_TELEMETRY,
    /** Programme expanded within the caps; waiting until output and frequency are steady. */
    AWAITING_STEADY,
    /** Sending the programme. */
    RUNNING,
    /** The whole programme ran. */
    FINISHED,
    /** Stopped part-way; nothing further was sent. */
    ABORTED,
    /** Never started: a safety check or the plan refused it; nothing was sent. */
    REFUSED
}
