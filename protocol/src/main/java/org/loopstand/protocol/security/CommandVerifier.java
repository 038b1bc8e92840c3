package org.loopstand.protocol.security;

import java.security.MessageDigest;
import java.util.Base64;
import java.util.EnumMap;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.concurrent.atomic.AtomicLong;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;

/**
 * Checks that a command is authentic and fresh before a unit acts on it. Checks, in this order
 * (the first failing one decides):
 * <ol>
 * <li>addressed to the receiving unit, else {@link RefusalReason#MALFORMED};</li>
 * <li>key id and signature both present, else {@link RefusalReason#MISSING_SIGNATURE};</li>
 * <li>key id known for the unit and valid now, else {@link RefusalReason#UNKNOWN_KEY};</li>
 * <li>HMAC matches (constant-time compare), else {@link RefusalReason#BAD_SIGNATURE};</li>
 * <li>now ≤ validUntil, else {@link RefusalReason#EXPIRED};</li>
 * <li>the time rules of {@link CommandTimeRules} (lifetime bound, issuedAt and epoch not ahead of
 * this clock), else {@link RefusalReason#BAD_LIFETIME} or {@link RefusalReason#NOT_YET_VALID};</li>
 * <li>(epoch, seq) above the last accepted from that controller, else {@link RefusalReason#REPLAYED}.</li>
 * </ol>
 * Authenticity comes before freshness so that an unauthenticated message can never move the replay
 * high-water mark. Every refusal is counted and sent to the event sink without key material.
 * Thread-safe.
 */
public final class CommandVerifier {
    /** Event kind of a refusal. */
    public static final String REFUSED_EVENT = "security.commandRefused";

    private final KeyRing keys;
    private final ReplayGuard replayGuard;
    private final Clock clock;
    private final MessageCodec codec;
    private final SecurityEventSink events;
    private final Map<RefusalReason, AtomicLong> refusals = new EnumMap<>(RefusalReason.class);
    private final AtomicLong accepted = new AtomicLong();

    /**
     * @param keys        the site's keys
     * @param replayGuard remembers the last accepted (epoch, seq) per unit and controller
     * @param clock       the receiving side's clock (expiry and key windows)
     * @param codec       the codec whose canonical encoding was signed
     * @param events      where refusals are recorded
     */
    public CommandVerifier(KeyRing keys, ReplayGuard replayGuard, Clock clock, MessageCodec codec,
            SecurityEventSink events) {
        this.keys = Objects.requireNonNull(keys, "keys");
        this.replayGuard = Objects.requireNonNull(replayGuard, "replayGuard");
        this.clock = Objects.requireNonNull(clock, "clock");
        this.codec = Objects.requireNonNull(codec, "codec");
        this.events = Objects.requireNonNull(events, "events");
        for (RefusalReason r : RefusalReason.values()) {
            refusals.put(r, new AtomicLong());
        }
    }

    /**
     * @param receivingUnit id of the unit whose command topic the command arrived on
     * @param command       the decoded command
     * @return accepted, or the refusal with its reason
     */
    public VerificationResult verify(String receivingUnit, UnitCommand command) {
        long nowMs = clock.epochMillis();
        VerificationResult result = check(receivingUnit, command, nowMs);
        if (result.accepted()) {
            accepted.incrementAndGet();
        } else {
            refusals.get(result.reason()).incrementAndGet();
            Map<String, Object> fields = new LinkedHashMap<>();
            fields.put("unit", receivingUnit);
            fields.put("controllerId", command.controllerId());
            fields.put("commandSeq", command.seq());
            fields.put("epoch", command.epoch());
            fields.put("keyId", command.keyId());
            fields.put("reason", result.reason().wireName());
            fields.put("detail", result.detail());
            events.event(nowMs, REFUSED_EVENT, fields);
        }
        return result;
    }

    private VerificationResult check(String receivingUnit, UnitCommand command, long nowMs) {
        if (!command.unit().equals(receivingUnit)) {
            return VerificationResult.refused(RefusalReason.MALFORMED,
                    "command for unit " + command.unit() + " arrived on unit " + receivingUnit + "'s topic");
        }
        if (command.keyId() == null || command.signature() == null) {
            return VerificationResult.refused(RefusalReason.MISSING_SIGNATURE,
                    command.keyId() == null && command.signature() == null ? "command is unsigned"
                            : command.keyId() == null ? "signature without key id" : "key id without signature");
        }
        Optional<UnitKey> found = keys.find(receivingUnit, command.keyId());
        if (found.isEmpty()) {
            return VerificationResult.refused(RefusalReason.UNKNOWN_KEY,
                    "no key '" + command.keyId() + "' for unit " + receivingUnit);
        }
        UnitKey key = found.get();
        if (!key.isValidAt(nowMs)) {
            return VerificationResult.refused(RefusalReason.UNKNOWN_KEY,
                    "key '" + key.keyId() + "' of unit " + receivingUnit + " is not valid at " + nowMs);
        }
        byte[] claimed;
        try {
            claimed = Base64.getDecoder().decode(command.signature());
        } catch (IllegalArgumentException e) {
            return VerificationResult.refused(RefusalReason.BAD_SIGNATURE, "signature is not base64");
        }
        byte[] expected;
        try {
            expected = CommandMac.mac(key, CommandMac.canonicalBytes(codec, command, key.keyId()));
        } catch (IllegalArgumentException e) {
            return VerificationResult.refused(RefusalReason.MALFORMED, "command breaks the contract: " + e.getMessage());
        }
        if (!MessageDigest.isEqual(expected, claimed)) {
            return VerificationResult.refused(RefusalReason.BAD_SIGNATURE,
                    "HMAC does not match key '" + key.keyId() + "' of unit " + receivingUnit);
        }
        if (nowMs > command.validUntil()) {
            return VerificationResult.refused(RefusalReason.EXPIRED,
                    "validUntil " + command.validUntil() + " is " + (nowMs - command.validUntil()) + " ms in the past");
        }
        VerificationResult timing = CommandTimeRules.check(command, nowMs);
        if (timing != null) {
            return timing;
        }
        Optional<String> replay = replayGuard.tryAccept(receivingUnit, command.controllerId(), command.epoch(),
                command.seq(), command.issuedAt());
        if (replay.isPresent()) {
            return VerificationResult.refused(RefusalReason.REPLAYED, replay.get());
        }
        return VerificationResult.ok();
    }

    /** @return commands refused for that reason so far */
    public long refusals(RefusalReason reason) {
        return refusals.get(reason).get();
    }

    /** @return commands refused for any reason so far */
    public long refusalsTotal() {
        return refusals.values().stream().mapToLong(AtomicLong::get).sum();
    }

    /** @return commands accepted so far */
    public long acceptedCount() {
        return accepted.get();
    }
}
