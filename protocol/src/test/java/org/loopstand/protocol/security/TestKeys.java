package org.loopstand.protocol.security;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;

/** Deterministic test keys (SHA-256 of a label: 32 bytes), so failures reproduce. */
public final class TestKeys {
    private TestKeys() {
    }

    public static byte[] bytes(String label) {
        try {
            return MessageDigest.getInstance("SHA-256").digest(label.getBytes(StandardCharsets.UTF_8));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    public static UnitKey key(String unit, String keyId) {
        return UnitKey.always(unit, keyId, bytes(unit + "." + keyId));
    }
}
