package org.loopstand.protocol.bus;

/** Told when a bus connection goes up or down (after resubscription, on the application's thread). */
public interface ConnectionListener {
    /** @param reconnect true when this is not the first connection of the session */
    void onConnected(boolean reconnect);

    /** @param cause why the link went down, may be null for a requested disconnect */
    void onDisconnected(Throwable cause);
}
