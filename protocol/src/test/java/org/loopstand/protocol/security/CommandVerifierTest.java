package org.loopstand.protocol.security;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Base64;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.function.UnaryOperator;
import org.junit.jupiter.api.Test;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.CommandKind;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.VirtualClock;

class CommandVerifierTest {
    private static final long T0_MS = 1_750_000_000_000L;
    private final VirtualClock clock = new VirtualClock(T0_MS);
    private final MessageCodec codec = new MessageCodec();
    private final KeyRing ring = KeyRing.of(List.of(TestKeys.key("G1", "k1"), TestKeys.key("G2", "k1")));
    private final CommandSigner signer = new CommandSigner(ring, clock, codec);
    private final List<Map<String, ?>> events = new ArrayList<>();
    @SuppressWarnings("unchecked")
    private final CommandVerifier verifier = new CommandVerifier(ring, new ReplayGuard(), clock, codec,
            (t, kind, fields) -> events.add((Map<String, ?>) fields));

    private static UnitCommand raise(long seq) {
        return UnitCommand.pulse(seq, T0_MS, "G1", "controller-1", 1, T0_MS + 4_000, PulseDirection.RAISE, 800);
    }

    @Test
    void shouldComputeHmacSha256LikeRfc4231TestCase6() {
        // RFC 4231 section 4.7 (test case 6): key = 0xaa x 131, data as below; from memory, re-derived
        // with Python's hmac module before use.
        byte[] key = new byte[131];
        java.util.Arrays.fill(key, (byte) 0xaa);
        byte[] mac = CommandMac.mac(UnitKey.always("G1", "k", key),
                "Test Using Larger Than Block-Size Key - Hash Key First".getBytes(StandardCharsets.US_ASCII));
        assertThat(HexFormat.of().formatHex(mac))
                .isEqualTo("60e431591ee0b67f0d8a26aacbf5b77f8e0bc6213728c5140546040f0ee37f54");
    }

    @Test
    void shouldAcceptASignedFreshCommandAndSurviveTheWire() {
        UnitCommand signed = signer.sign(raise(1));
        UnitCommand received = ((Decoded.Ok<UnitCommand>) codec.decode(codec.encode(signed), UnitCommand.class)).value();

        assertThat(signed.keyId()).isEqualTo("k1");
        assertThat(Base64.getDecoder().decode(signed.signature())).hasSize(32);
        assertThat(verifier.verify("G1", received)).isEqualTo(VerificationResult.ok());
        assertThat(verifier.acceptedCount()).isEqualTo(1);
        assertThat(verifier.refusalsTotal()).isZero();
    }

    @Test
    void shouldRefuseUnsignedAndHalfSignedCommandsAsMissingSignature() {
        UnitCommand signed = signer.sign(raise(1));
        assertThat(verifier.verify("G1", raise(1)).reason()).isEqualTo(RefusalReason.MISSING_SIGNATURE);
        assertThat(verifier.verify("G1", signed.withSignature(null, signed.signature())).reason())
                .isEqualTo(RefusalReason.MISSING_SIGNATURE);
        assertThat(verifier.verify("G1", signed.withSignature("k1", null)).reason())
                .isEqualTo(RefusalReason.MISSING_SIGNATURE);
        assertThat(verifier.refusals(RefusalReason.MISSING_SIGNATURE)).isEqualTo(3);
    }

    @Test
    void shouldRefuseAForgedSignatureMadeWithAnotherKey() {
        UnitKey attackerKey = UnitKey.always("G1", "k1", TestKeys.bytes("attacker"));
        UnitCommand forged = signer.sign(raise(1), attackerKey);

        VerificationResult r = verifier.verify("G1", forged);
        assertThat(r.reason()).isEqualTo(RefusalReason.BAD_SIGNATURE);
        assertThat(verifier.refusals(RefusalReason.BAD_SIGNATURE)).isEqualTo(1);
    }

    @Test
    void shouldRefuseAUnitBSignatureReplayedOntoUnitA() {
        // A command validly signed for G2, with its unit field rewritten to G1.
        UnitCommand forG2 = signer.sign(new UnitCommand(1, T0_MS, "G2", "controller-1", 1, T0_MS, T0_MS + 4_000,
                CommandKind.PULSE, PulseDirection.RAISE, 800, null, null, null));
        UnitCommand retargeted = new UnitCommand(1, T0_MS, "G1", "controller-1", 1, T0_MS, T0_MS + 4_000,
                CommandKind.PULSE, PulseDirection.RAISE, 800, null, forG2.keyId(), forG2.signature());

        assertThat(verifier.verify("G1", forG2).reason()).isEqualTo(RefusalReason.MALFORMED);
        assertThat(verifier.verify("G1", retargeted).reason()).isEqualTo(RefusalReason.BAD_SIGNATURE);
    }

    @Test
    void shouldRefuseEveryTamperedFieldAsBadSignature() {
        UnitCommand s = signer.sign(raise(5));
        List<UnaryOperator<UnitCommand>> edits = List.of(
                c -> new UnitCommand(6, c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil(), c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime() + 1, c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil(), c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), "controller-2", c.epoch(), c.issuedAt(),
                        c.validUntil(), c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), 2, c.issuedAt(),
                        c.validUntil(), c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt() + 1,
                        c.validUntil(), c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil() + 60_000, c.kind(), c.direction(), c.durationMs(), c.setpointMw(), c.keyId(),
                        c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil(), c.kind(), PulseDirection.LOWER, c.durationMs(), c.setpointMw(), c.keyId(),
                        c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil(), c.kind(), c.direction(), 8_000, c.setpointMw(), c.keyId(), c.signature()),
                c -> new UnitCommand(c.seq(), c.sourceTime(), c.unit(), c.controllerId(), c.epoch(), c.issuedAt(),
                        c.validUntil(), CommandKind.SETPOINT, null, 0, 250.0, c.keyId(), c.signature()));

        for (UnaryOperator<UnitCommand> edit : edits) {
            UnitCommand tampered = edit.apply(s);
            assertThat(tampered).isNotEqualTo(s);
            assertThat(verifier.verify("G1", tampered).reason()).as(tampered.toString())
                    .isEqualTo(RefusalReason.BAD_SIGNATURE);
        }
        assertThat(verifier.refusals(RefusalReason.BAD_SIGNATURE)).isEqualTo(edits.size());
        // The untouched original still passes: the refusals did not move the replay mark.
        assertThat(verifier.verify("G1", s).accepted()).isTrue();
    }

    @Test
    void shouldRefuseAFlippedSignatureBitAndNonBase64Signature() {
        UnitCommand s = signer.sign(raise(1));
        byte[] sig = Base64.getDecoder().decode(s.signature());
        sig[31] ^= 1;
        assertThat(verifier.verify("G1", s.withSignature("k1", Base64.getEncoder().encodeToString(sig))).reason())
                .isEqualTo(RefusalReason.BAD_SIGNATURE);
        assertThat(verifier.verify("G1", s.withSignature("k1", "not base64!")).reason())
                .isEqualTo(RefusalReason.BAD_SIGNATURE);
        assertThat(verifier.verify("G1", s.withSignature("k1", "")).reason()).isEqualTo(RefusalReason.BAD_SIGNATURE);
    }

    @Test
    void shouldRefuseAnUnknownKeyId() {
        UnitCommand s = signer.sign(raise(1), UnitKey.always("G1", "k9", TestKeys.bytes("G1.k9")));
        VerificationResult r = verifier.verify("G1", s);
        assertThat(r.reason()).isEqualTo(RefusalReason.UNKNOWN_KEY);
        assertThat(r.detail()).contains("k9");
    }

    @Test
    void shouldRefuseAReplayedSeqAndAnOlderEpochButAcceptANewEpoch() {
        UnitCommand first = signer.sign(raise(7));
        assertThat(verifier.verify("G1", first).accepted()).isTrue();
        assertThat(verifier.verify("G1", first).reason()).isEqualTo(RefusalReason.REPLAYED);
        assertThat(verifier.verify("G1", signer.sign(raise(6))).reason()).isEqualTo(RefusalReason.REPLAYED);
        assertThat(verifier.verify("G1", signer.sign(raise(8))).accepted()).isTrue();

        UnitCommand newEpoch = signer.sign(new UnitCommand(0, T0_MS, "G1", "controller-1", 2, T0_MS, T0_MS + 4_000,
                CommandKind.PULSE, PulseDirection.RAISE, 800, null, null, null));
        assertThat(verifier.verify("G1", newEpoch).accepted()).isTrue();
        assertThat(verifier.verify("G1", signer.sign(raise(9))).reason()).as("epoch 1 after epoch 2")
                .isEqualTo(RefusalReason.REPLAYED);
        assertThat(verifier.refusals(RefusalReason.REPLAYED)).isEqualTo(3);
    }

    @Test
    void shouldRefuseAnExpiredCommandEvenWhenCorrectlySigned() {
        UnitCommand s = signer.sign(raise(1));
        clock.advanceMillis(4_000);
        assertThat(verifier.verify("G1", s).accepted()).as("at validUntil exactly").isTrue();
        UnitCommand s2 = signer.sign(raise(2));
        clock.advanceMillis(1);
        VerificationResult r = verifier.verify("G1", s2);
        assertThat(r.reason()).isEqualTo(RefusalReason.EXPIRED);
        assertThat(r.detail()).contains("1 ms in the past");
    }

    @Test
    void shouldRefuseASignedCommandWithAYearLongLifetimeOrIssuedAheadOfTheUnitsClock() {
        UnitCommand yearLong = signer.sign(new UnitCommand(1, T0_MS, "G1", "controller-1", 1, T0_MS,
                T0_MS + 365L * 86_400_000L, CommandKind.PULSE, PulseDirection.RAISE, 1_000, null, null, null));
        assertThat(verifier.verify("G1", yearLong).reason()).isEqualTo(RefusalReason.BAD_LIFETIME);
        long ahead = T0_MS + CommandTimeRules.MAX_ISSUED_AHEAD_MS + 1;
        UnitCommand future = signer.sign(new UnitCommand(2, ahead, "G1", "controller-1", 1, ahead, ahead + 4_000,
                CommandKind.PULSE, PulseDirection.RAISE, 1_000, null, null, null));
        assertThat(verifier.verify("G1", future).reason()).isEqualTo(RefusalReason.NOT_YET_VALID);
        // neither moved the replay mark: the real seq 1 still goes through
        assertThat(verifier.verify("G1", signer.sign(raise(1))).accepted()).isTrue();
    }

    @Test
    void shouldAcceptBothKeysDuringTheRotationOverlapOnly() {
        long overlapStart = T0_MS + 10_000;
        long overlapEnd = T0_MS + 20_000;
        UnitKey old = new UnitKey("G1", "old", TestKeys.bytes("old"), Long.MIN_VALUE, overlapEnd);
        UnitKey fresh = new UnitKey("G1", "new", TestKeys.bytes("new"), overlapStart, Long.MAX_VALUE);
        KeyRing rotating = KeyRing.of(List.of(old, fresh));
        CommandSigner s = new CommandSigner(rotating, clock, codec);
        CommandVerifier v = new CommandVerifier(rotating, new ReplayGuard(), clock, codec, SecurityEventSink.NONE);

        assertThat(s.sign(raise(1)).keyId()).as("before overlap").isEqualTo("old");
        assertThat(v.verify("G1", s.sign(raise(1), fresh)).reason()).as("new key not yet valid")
                .isEqualTo(RefusalReason.UNKNOWN_KEY);

        clock.advanceMillis(15_000);
        UnitCommand inOverlap = s.sign(withTimes(raise(2)));
        assertThat(inOverlap.keyId()).as("signer moves to the new key in the overlap").isEqualTo("new");
        assertThat(v.verify("G1", inOverlap).accepted()).isTrue();
        assertThat(v.verify("G1", s.sign(withTimes(raise(3)), old)).accepted()).as("old key still accepted").isTrue();

        clock.advanceMillis(10_000);
        assertThat(v.verify("G1", s.sign(withTimes(raise(4)), old)).reason()).as("old key after overlap")
                .isEqualTo(RefusalReason.UNKNOWN_KEY);
        assertThat(v.verify("G1", s.sign(withTimes(raise(5)), fresh)).accepted()).isTrue();
    }

    private UnitCommand withTimes(UnitCommand c) {
        long now = clock.epochMillis();
        return new UnitCommand(c.seq(), now, c.unit(), c.controllerId(), c.epoch(), now, now + 4_000, c.kind(),
                c.direction(), c.durationMs(), c.setpointMw(), null, null);
    }

    @Test
    void shouldJournalRefusalsWithoutKeyMaterial() {
        UnitKey attackerKey = UnitKey.always("G1", "k1", TestKeys.bytes("attacker"));
        UnitCommand forged = signer.sign(raise(3), attackerKey);
        verifier.verify("G1", forged);

        assertThat(events).hasSize(1);
        Map<String, ?> e = events.get(0);
        assertThat(e.get("reason")).isEqualTo("badSignature");
        assertThat(e.get("commandSeq")).isEqualTo(3L);
        assertThat(e.get("keyId")).isEqualTo("k1");
        String all = e.toString();
        for (byte[] secret : List.of(TestKeys.bytes("G1.k1"), TestKeys.bytes("attacker"))) {
            assertThat(all).doesNotContain(Base64.getEncoder().encodeToString(secret))
                    .doesNotContain(HexFormat.of().formatHex(secret));
        }
        assertThat(all).doesNotContain(forged.signature());
    }

    @Test
    void shouldRefuseSigningForAUnitWithoutKey() {
        UnitCommand forG9 = UnitCommand.pulse(1, T0_MS, "G9", "controller-1", 1, T0_MS + 1, PulseDirection.RAISE, 1);
        assertThatThrownBy(() -> signer.sign(forG9)).isInstanceOf(IllegalStateException.class)
                .hasMessageContaining("G9").hasMessageContaining("no key");
    }
}
