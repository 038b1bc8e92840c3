package org.loopstand.protocol.security.broker;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.CommandVerifier;
import org.loopstand.protocol.security.KeyRing;
import org.loopstand.protocol.security.ReplayGuard;
import org.loopstand.protocol.security.SecurityEventSink;
import org.loopstand.protocol.security.TestKeys;
import org.loopstand.protocol.security.UnitKey;
import org.loopstand.protocol.security.VerificationResult;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The whole command path over MqttLink and a secured real Mosquitto: controller identity signs,
 * unit G1 verifies; forged, tampered, replayed, expired and unsigned commands are all refused, and
 * a command from another unit's identity never reaches G1 at all.
 */
class SecureCommandPathMosquittoTest {
    private static final TopicTree T = TopicTree.forSite("rig1");
    private final MessageCodec codec = new MessageCodec();
    private final WallClock clock = WallClock.INSTANCE;
    private final KeyRing ring = KeyRing.of(List.of(TestKeys.key("G1", "k1"), TestKeys.key("G2", "k1")));

    private MqttLink link(SecureMosquitto broker, String username) throws Exception {
        MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(broker.sslUri()).clientId(username + "-link")
                .credentials(username, SecureMosquitto.passwordOf(username).toCharArray())
                .sslSocketFactory(broker.trustedClientFactory(username)).build(), clock).start();
        assertThat(link.awaitConnected(10_000)).as(username + " connected").isTrue();
        return link;
    }

    @Test
    void shouldRefuseEveryForgedTamperedReplayedExpiredAndUnsignedCommandEndToEnd(@TempDir Path dir)
            throws Exception {
        List<VerificationResult> results = new CopyOnWriteArrayList<>();
        List<Long> acceptedSeqs = new CopyOnWriteArrayList<>();
        CommandVerifier verifier = new CommandVerifier(ring, new ReplayGuard(), clock, codec, SecurityEventSink.NONE);
        CommandSigner signer = new CommandSigner(ring, clock, codec);

        try (SecureMosquitto broker = SecureMosquitto.start(BrokerAclMosquittoTest.MODEL, dir);
                MqttLink unit = link(broker, "unit-G1");
                MqttLink controller = link(broker, "controller-1");
                MqttLink otherUnit = link(broker, "unit-G2")) {
            unit.subscribe(T.unitCommand("G1"), Qos.AT_LEAST_ONCE, m -> {
                if (codec.decode(m.payload(), UnitCommand.class) instanceof Decoded.Ok<UnitCommand> ok) {
                    VerificationResult r = verifier.verify("G1", ok.value());
                    results.add(r);
                    if (r.accepted()) {
                        acceptedSeqs.add(ok.value().seq());
                    }
                }
            });
            await().atMost(Duration.ofSeconds(5)).until(() -> unit.isConnected());

            long now = clock.epochMillis();
            UnitCommand good = signer.sign(raise(1, now, now + 10_000));
            UnitCommand forged = signer.sign(raise(2, now, now + 10_000),
                    UnitKey.always("G1", "k1", TestKeys.bytes("attacker")));
            UnitCommand signed3 = signer.sign(raise(3, now, now + 10_000));
            UnitCommand tampered = new UnitCommand(signed3.seq(), signed3.sourceTime(), "G1", "controller-1", 1,
                    signed3.issuedAt(), signed3.validUntil(), signed3.kind(), signed3.direction(), 60_000, null,
                    signed3.keyId(), signed3.signature());
            UnitCommand expired = signer.sign(raise(4, now - 20_000, now - 10_000));
            UnitCommand unsigned = raise(5, now, now + 10_000);
            UnitCommand last = signer.sign(raise(6, now, now + 10_000));

            // Another unit's identity, even with a validly signed command, is stopped by the broker.
            otherUnit.publish(command(signer.sign(raise(100, now, now + 10_000)))).handle((v, e) -> null)
                    .get(10, java.util.concurrent.TimeUnit.SECONDS); // processed by the broker before the rest
            for (UnitCommand c : List.of(good, forged, tampered, good, expired, unsigned, last)) {
                controller.publish(command(c)).get();
            }

            await().atMost(Duration.ofSeconds(10)).until(() -> results.size() >= 7);
            assertThat(results).extracting(VerificationResult::reason).containsExactly(null,
                    RefusalReason.BAD_SIGNATURE, RefusalReason.BAD_SIGNATURE, RefusalReason.REPLAYED,
                    RefusalReason.EXPIRED, RefusalReason.MISSING_SIGNATURE, null);
            assertThat(acceptedSeqs).containsExactly(1L, 6L);
            assertThat(verifier.refusalsTotal()).isEqualTo(5);
            assertThat(verifier.acceptedCount()).isEqualTo(2);
        }
    }

    private static UnitCommand raise(long seq, long issuedAtMs, long validUntilMs) {
        return UnitCommand.pulse(seq, issuedAtMs, "G1", "controller-1", 1, validUntilMs, PulseDirection.RAISE, 800);
    }

    private OutboundMessage command(UnitCommand c) {
        return OutboundMessage.of(T.unitCommand("G1"), codec.encode(c), Qos.AT_LEAST_ONCE);
    }
}
