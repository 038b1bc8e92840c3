package org.loopstand.plant.fault;

/**
 * What connection faults need from one bus connection. Implemented for MQTT links and in-memory
 * connections by the plant runtime's BusLinkFaults; the
 * {@link FaultEngine} calls it on the agent thread when a connection fault starts and ends.
 */
public interface LinkFaultControl {
    /** Cuts the connection without an MQTT DISCONNECT, so the broker publishes the last will. */
    void disconnectAbruptly();

    /** Sends DISCONNECT and closes: no last will. */
    void disconnectCleanly();

    /**
     * Refuses to reconnect for {@code refuseS} seconds from now (scenario time); 0 allows reconnecting
     * at once, +∞ refuses until called again.
     */
    void refuseReconnectForS(double refuseS);

    /**
     * Called by {@link FaultEngine#update()} on every duty cycle: lets the control end a refusal whose
     * time has come (on the run's clock). @return work done (0 or 1)
     */
    default int poll() {
        return 0;
    }
}
