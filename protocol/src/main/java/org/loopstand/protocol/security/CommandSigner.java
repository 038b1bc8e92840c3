package org.loopstand.protocol.security;

import java.util.Base64;
import java.util.Objects;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;

/**
 * Signs commands with the target unit's current key (HMAC-SHA256 over the canonical bytes; see
 * docs/security.md). Thread-safe.
 */
public final class CommandSigner {
    private final KeyRing keys;
    private final Clock clock;
    private final MessageCodec codec;

    /**
     * @param keys  the site's keys
     * @param clock picks the key valid now (the newest during a rotation overlap)
     * @param codec the codec whose canonical encoding is signed
     */
    public CommandSigner(KeyRing keys, Clock clock, MessageCodec codec) {
        this.keys = Objects.requireNonNull(keys, "keys");
        this.clock = Objects.requireNonNull(clock, "clock");
        this.codec = Objects.requireNonNull(codec, "codec");
    }

    /**
     * @return the command with keyId and signature set
     * @throws IllegalStateException when the unit has no key valid now (naming the unit)
     * @throws IllegalArgumentException when the command breaks the contract
     */
    public UnitCommand sign(UnitCommand command) {
        long nowMs = clock.epochMillis();
        UnitKey key = keys.signingKey(command.unit(), nowMs)
                .orElseThrow(() -> new IllegalStateException("no key for unit " + command.unit() + " valid at " + nowMs
                        + (keys.hasUnit(command.unit()) ? " (all its keys are outside their validity window)"
                                : " (the key ring has no key for this unit)")));
        return sign(command, key);
    }

    /** @return the command signed with that key (for tests and tools) */
    public UnitCommand sign(UnitCommand command, UnitKey key) {
        byte[] mac = CommandMac.mac(key, CommandMac.canonicalBytes(codec, command, key.keyId()));
        return command.withSignature(key.keyId(), Base64.getEncoder().encodeToString(mac));
    }
}
