package org.loopstand.protocol.security;

import java.util.Objects;
import org.loopstand.protocol.message.RefusalReason;

/**
 * Outcome of checking one command's authenticity and freshness.
 *
 * @param accepted whether the command may go on to the unit's own checks
 * @param reason   why it was refused; null when accepted
 * @param detail   human-readable explanation, never containing key material
 */
public record VerificationResult(boolean accepted, RefusalReason reason, String detail) {
    private static final VerificationResult ACCEPTED = new VerificationResult(true, null, "accepted");

    public VerificationResult {
        Objects.requireNonNull(detail, "detail");
        if (accepted != (reason == null)) {
            throw new IllegalArgumentException("an accepted result has no reason, a refused one has one");
        }
    }

    /** @return the accepted result */
    public static VerificationResult ok() {
        return ACCEPTED;
    }

    /** @return a refusal with its reason and detail */
    public static VerificationResult refused(RefusalReason reason, String detail) {
        return new VerificationResult(false, Objects.requireNonNull(reason, "reason"), detail);
    }
}
