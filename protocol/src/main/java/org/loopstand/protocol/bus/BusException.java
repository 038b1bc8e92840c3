package org.loopstand.protocol.bus;

/** A publish or subscribe that the bus could not carry out, with the reason. */
public class BusException extends Exception {
    private static final long serialVersionUID = 1L;

    /** Why a bus operation failed. */
    public enum Reason {
        NOT_CONNECTED, BACK_PRESSURE, REFUSED_BY_BROKER, CLOSED, TIMEOUT, TRANSPORT_ERROR
    }

    private final Reason reason;

    public BusException(Reason reason, String message, Throwable cause) {
        super(message, cause);
        this.reason = reason;
    }

    public BusException(Reason reason, String message) {
        this(reason, message, null);
    }

    public Reason reason() {
        return reason;
    }
}
