package org.loopstand.protocol.codec;

import java.util.Objects;
import java.util.Optional;

/**
 * Result of {@link MessageCodec#decode}: a valid message or the reason it was refused.
 *
 * @param <T> message type
 */
public sealed interface Decoded<T> permits Decoded.Ok, Decoded.Rejected {

    /** @return whether a message was decoded */
    boolean isOk();

    /** @return the message, or empty if rejected */
    Optional<T> message();

    /** @return the error, or empty if decoded */
    Optional<DecodeError> rejection();

    /** A decoded, validated message. */
    record Ok<T>(T value) implements Decoded<T> {
        public Ok {
            Objects.requireNonNull(value, "value");
        }

        @Override
        public boolean isOk() {
            return true;
        }

        @Override
        public Optional<T> message() {
            return Optional.of(value);
        }

        @Override
        public Optional<DecodeError> rejection() {
            return Optional.empty();
        }
    }

    /** A refused payload. */
    record Rejected<T>(DecodeError error) implements Decoded<T> {
        public Rejected {
            Objects.requireNonNull(error, "error");
        }

        @Override
        public boolean isOk() {
            return false;
        }

        @Override
        public Optional<T> message() {
            return Optional.empty();
        }

        @Override
        public Optional<DecodeError> rejection() {
            return Optional.of(error);
        }
    }
}
