package org.loopstand.protocol.codec;

import java.util.Objects;

/**
 * One refused payload.
 *
 * @param kind   what is wrong
 * @param field  JSON path of the offending field, e.g. {@code ties[1].flowMw}; {@code $} for the
 *               whole payload
 * @param detail human-readable explanation
 */
public record DecodeError(DecodeErrorKind kind, String field, String detail) {
    /** Path used when the payload as a whole is at fault. */
    public static final String ROOT = "$";

    public DecodeError {
        Objects.requireNonNull(kind, "kind");
        field = field == null || field.isEmpty() ? ROOT : field;
        detail = detail == null ? "" : detail;
    }

    @Override
    public String toString() {
        return kind + " at " + field + ": " + detail;
    }
}
