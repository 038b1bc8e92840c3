package org.loopstand.protocol.security;

import java.security.GeneralSecurityException;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.UnitCommand;

/** The HMAC-SHA256 over a command's or a status's canonical bytes, shared by signers and verifiers. */
final class CommandMac {
    static final String ALGORITHM = "HmacSHA256";

    private CommandMac() {
    }

    /**
     * The signed bytes: the codec's canonical encoding of the command with the key id set and the
     * signature absent, so every field (seq, validUntil, key id included) is covered.
     */
    static byte[] canonicalBytes(MessageCodec codec, UnitCommand command, String keyId) {
        return codec.encode(command.withSignature(keyId, null));
    }

    /** The signed bytes of a controller status, built the same way as a command's. */
    static byte[] canonicalBytes(MessageCodec codec, ControllerStatus status, String keyId) {
        return codec.encode(status.withSignature(keyId, null));
    }

    static byte[] mac(UnitKey key, byte[] data) {
        try {
            Mac mac = Mac.getInstance(ALGORITHM);
            mac.init(new SecretKeySpec(key.secret(), ALGORITHM));
            return mac.doFinal(data);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(ALGORITHM + " is not available in this JVM", e);
        }
    }
}
