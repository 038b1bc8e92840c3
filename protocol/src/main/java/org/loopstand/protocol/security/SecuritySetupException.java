package org.loopstand.protocol.security;

/** A process may not start with the security settings it was given; the message says why and how to fix it. */
public final class SecuritySetupException extends Exception {
    private static final long serialVersionUID = 1L;

    public SecuritySetupException(String message) {
        super(message);
    }
}
