package org.loopstand.protocol.security;

import java.security.GeneralSecurityException;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.UnitCommand;

/** The HMAC-SHA256 over a command's canonical bytes, shared by signer and verifier. */
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
