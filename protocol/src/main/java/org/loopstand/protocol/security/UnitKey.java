package org.loopstand.protocol.security;

import java.util.Arrays;
import java.util.Objects;
import org.loopstand.protocol.message.Ids;

/**
 * One HMAC key of one unit, with the window in which it is accepted.
 *
 * <p>Rotation: give the new key a validFrom before the old key's validUntil; during that overlap
 * both verify and the signer uses the newer one. {@link #toString()} never prints the key bytes.
 *
 * @param unit        unit id the key belongs to
 * @param keyId       key id carried in the command (id rule of the contract)
 * @param secret      key bytes, at least {@link #MIN_KEY_BYTES}; copied in and out
 * @param validFromMs epoch ms from which the key is accepted (inclusive), or {@link Long#MIN_VALUE}
 * @param validUntilMs epoch ms until which the key is accepted (exclusive), or {@link Long#MAX_VALUE}
 */
public record UnitKey(String unit, String keyId, byte[] secret, long validFromMs, long validUntilMs) {
    /** Shortest key accepted: 32 bytes = the HMAC-SHA256 output size (RFC 2104 section 3: from memory). */
    public static final int MIN_KEY_BYTES = 32;

    public UnitKey {
        Ids.requireValid("unit", unit);
        Ids.requireValid("key", keyId);
        Objects.requireNonNull(secret, "secret");
        if (secret.length < MIN_KEY_BYTES) {
            throw new IllegalArgumentException("key " + unit + "." + keyId + " is " + secret.length
                    + " bytes; at least " + MIN_KEY_BYTES + " bytes are required");
        }
        if (validUntilMs <= validFromMs) {
            throw new IllegalArgumentException("key " + unit + "." + keyId + ": validUntil (" + validUntilMs
                    + ") must be after validFrom (" + validFromMs + ")");
        }
        secret = secret.clone();
    }

    /** @return a key valid at all times */
    public static UnitKey always(String unit, String keyId, byte[] secret) {
        return new UnitKey(unit, keyId, secret, Long.MIN_VALUE, Long.MAX_VALUE);
    }

    /** @return a copy of the key bytes */
    @Override
    public byte[] secret() {
        return secret.clone();
    }

    /** @return whether the key is accepted at the given epoch ms */
    public boolean isValidAt(long epochMs) {
        return epochMs >= validFromMs && epochMs < validUntilMs;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof UnitKey k && unit.equals(k.unit) && keyId.equals(k.keyId)
                && Arrays.equals(secret, k.secret) && validFromMs == k.validFromMs && validUntilMs == k.validUntilMs;
    }

    @Override
    public int hashCode() {
        return Objects.hash(unit, keyId, validFromMs, validUntilMs);
    }

    @Override
    public String toString() {
        return "UnitKey[" + unit + "." + keyId + ", " + secret.length + " bytes, validFrom=" + bound(validFromMs)
                + ", validUntil=" + bound(validUntilMs) + "]";
    }

    private static String bound(long ms) {
        return ms == Long.MIN_VALUE || ms == Long.MAX_VALUE ? "open" : Long.toString(ms);
    }
}
