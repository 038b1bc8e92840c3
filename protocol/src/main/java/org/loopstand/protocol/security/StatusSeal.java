package org.loopstand.protocol.security;

import java.security.MessageDigest;
import java.util.Base64;
import java.util.Objects;
import java.util.Optional;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.message.RefusalReason;

/**
 * Signs and checks controller statuses when keys are configured: HMAC-SHA256 over the status's
 * canonical bytes (as for commands) with the controller's status key, the keys-file line
 * {@code <controllerId>.<keyId> = <base64>} (the key ring holds it like a unit's key, under the
 * controller id). Every plant or unit process that checks statuses needs that line; the broker ACL
 * still keeps unit identities from publishing on a status topic. Thread-safe.
 */
public final class StatusSeal {
    private final KeyRing keys;
    private final MessageCodec codec;

    public StatusSeal(KeyRing keys, MessageCodec codec) {
        this.keys = Objects.requireNonNull(keys, "keys");
        this.codec = Objects.requireNonNull(codec, "codec");
    }

    /** @return whether the ring holds a status key for that controller */
    public boolean hasKeyFor(String controllerId) {
        return keys.hasUnit(controllerId);
    }

    /**
     * @param nowMs picks the key valid now
     * @return the status signed with the controller's current key
     * @throws IllegalStateException when the ring has no status key for that controller valid now
     */
    public ControllerStatus sign(ControllerStatus status, long nowMs) {
        UnitKey key = keys.signingKey(status.controllerId(), nowMs)
                .orElseThrow(() -> new IllegalStateException("no status key for controller " + status.controllerId()
                        + " valid at " + nowMs + " (keys-file line " + status.controllerId() + ".<keyId>)"));
        byte[] mac = CommandMac.mac(key, CommandMac.canonicalBytes(codec, status, key.keyId()));
        return status.withSignature(key.keyId(), Base64.getEncoder().encodeToString(mac));
    }

    /**
     * @param nowMs receiver's clock (key validity)
     * @return accepted, or the refusal ({@code missingSignature}, {@code unknownKey}, {@code badSignature})
     */
    public VerificationResult verify(ControllerStatus status, long nowMs) {
        if (status.keyId() == null || status.signature() == null) {
            return VerificationResult.refused(RefusalReason.MISSING_SIGNATURE, "status is unsigned");
        }
        Optional<UnitKey> found = keys.find(status.controllerId(), status.keyId());
        if (found.isEmpty() || !found.get().isValidAt(nowMs)) {
            return VerificationResult.refused(RefusalReason.UNKNOWN_KEY, "no status key '" + status.keyId()
                    + "' of controller " + status.controllerId() + " valid at " + nowMs);
        }
        byte[] claimed;
        try {
            claimed = Base64.getDecoder().decode(status.signature());
        } catch (IllegalArgumentException e) {
            return VerificationResult.refused(RefusalReason.BAD_SIGNATURE, "signature is not base64");
        }
        byte[] expected;
        try {
            expected = CommandMac.mac(found.get(), CommandMac.canonicalBytes(codec, status, status.keyId()));
        } catch (IllegalArgumentException e) {
            return VerificationResult.refused(RefusalReason.MALFORMED, "status breaks the contract: " + e.getMessage());
        }
        if (!MessageDigest.isEqual(expected, claimed)) {
            return VerificationResult.refused(RefusalReason.BAD_SIGNATURE,
                    "HMAC does not match status key '" + status.keyId() + "' of controller " + status.controllerId());
        }
        return VerificationResult.ok();
    }
}
