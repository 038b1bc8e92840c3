package org.loopstand.plant.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.awaitility.Awaitility.await;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.plant.unit.PlantJournal;
import org.loopstand.plant.unit.UnitPlantInterface;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.CommandVerifier;
import org.loopstand.protocol.security.KeyRing;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.TestKeys;
import org.loopstand.protocol.security.UnitKey;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.security.broker.SecureMosquitto;
import org.loopstand.protocol.security.broker.SecuredSiteFiles;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The real plant (PlantRunner, UnitPlantInterface) on a secured private Mosquitto (password file,
 * generated ACL, mutual TLS from the shipped template), wired the way the {@code plant} command wires
 * it: credentials file, trust/key stores, keys file, one verifier per process. Every forged,
 * tampered, replayed, expired, unsigned or unknown-key command is refused with its own reason,
 * counted, journaled without key material, and leaves the load reference where it was; a command
 * signed with the unit's key from the controller identity is accepted and moves it.
 */
class SecuredPlantMosquittoTest {
    static final String UNIT = "ridge-hydro-1"; // pulse rate 50 MW/min (demo site)
    static final long PULSE_MS = 1_200; // 50 MW/min × 1.2 s = 1.0 MW
    final MessageCodec codec = new MessageCodec();
    final WallClock clock = WallClock.INSTANCE;

    @TempDir
    Path dir;
    SecureMosquitto broker;
    PlantRunner plant;
    MqttLink controller;
    Grid grid;
    TopicTree topics;
    KeyRing keys;

    @BeforeEach
    void start() throws Exception {
        String site = "sec" + ProcessHandle.current().pid();
        Path siteFile = Files.writeString(dir.resolve("site.yaml"), Files.readString(Path.of("..", "config", "sites",
                "demo-site.yaml")).replace("siteId: demo-site", "siteId: " + site));
        grid = SiteLoader.load(siteFile);
        topics = TopicTree.forSite(site);
        BrokerAccessModel model = PlantSecurity.accessModel(grid, Set.of("controller-1"));
        broker = SecureMosquitto.start(model, Files.createDirectories(dir.resolve("broker")));
        List<String> units = grid.units().stream().map(GeneratingUnit::id).toList();
        SecuredSiteFiles files = SecuredSiteFiles.write(broker, model, units, dir.resolve("files"));
        LinkSecurity security = files.multiIdentity("plant").resolve(broker.sslUri(), Map.of());
        assertThat(security.signsCommands()).isTrue();
        keys = security.keys().orElseThrow();

        PlantOptions o = new PlantOptions(1, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                grid.areas().stream().map(a -> MeterSettings.defaults(a.id())).toList(),
                InterfaceOptions.defaults().withTelemetryScanMs(250, Map.of()), Qos.AT_MOST_ONCE, 256, 1, 1.0);
        plant = new PlantRunner(new GridSimulator(grid), List.of(), o,
                MqttLinks.to(broker.sslUri(), clock, security, site), clock, s -> { });
        CommandVerifier v = PlantSecurity.requireSignedCommands(security,
                plant.unitCycles().stream().map(UnitDutyCycle::unit).toList(), clock);
        assertThat(v).isNotNull();
        plant.start();
        await().atMost(Duration.ofSeconds(20)).until(() -> plant.buses().stream().allMatch(b -> b.isConnected()));

        controller = new MqttLink(MqttLinkConfig.builder().serverUri(broker.sslUri()).clientId("controller-1")
                .credentials("controller-1", SecureMosquitto.passwordOf("controller-1").toCharArray())
                .sslSocketFactory(broker.trustedClientFactory("controller-1")).build(), clock).start();
        assertThat(controller.awaitConnected(10_000)).isTrue();
    }

    @AfterEach
    void stop() throws Exception {
        if (controller != null) {
            controller.close();
        }
        if (plant != null) {
            plant.close();
        }
        if (broker != null) {
            broker.close();
        }
    }

    @Test
    void shouldRefuseEveryForgedTamperedReplayedExpiredUnsignedAndUnknownKeyCommandAndAcceptTheSignedOne()
            throws Exception {
        Inbox acks = new Inbox();
        Inbox telemetry = new Inbox();
        controller.subscribe(topics.unitAck(UNIT), Qos.AT_LEAST_ONCE, acks);
        controller.subscribe(topics.unitTelemetry(UNIT), Qos.AT_MOST_ONCE, telemetry);
        await().atMost(Duration.ofSeconds(10)).until(() -> !telemetry.messages().isEmpty());
        UnitPlantInterface unit = plant.unitCycle(UNIT).unit();
        double startMw = lastSetpoint(telemetry);

        CommandSigner signer = new CommandSigner(keys, clock, codec);
        long now = clock.epochMillis();
        long epoch = now;
        UnitCommand forged = signer.sign(raise(10, now, epoch),
                UnitKey.always(UNIT, SecuredSiteFiles.KEY_ID, TestKeys.bytes("not the unit's key")));
        UnitCommand signed11 = signer.sign(raise(11, now, epoch));
        UnitCommand tampered = new UnitCommand(11, signed11.sourceTime(), UNIT, "controller-1", epoch,
                signed11.issuedAt(), signed11.validUntil(), signed11.kind(), signed11.direction(), 60_000, null,
                signed11.keyId(), signed11.signature()); // duration edited after signing
        UnitCommand expired = signer.sign(UnitCommand.pulse(12, now - 20_000, UNIT, "controller-1", epoch, now - 10_000,
                PulseDirection.RAISE, PULSE_MS));
        UnitCommand unsigned = raise(13, now, epoch);
        UnitCommand unknownKey = signer.sign(raise(14, now, epoch), UnitKey.always(UNIT, "k9", TestKeys.bytes(UNIT + ".k9")));
        for (UnitCommand c : List.of(forged, tampered, expired, unsigned, unknownKey)) {
            send(c);
        }
        await().atMost(Duration.ofSeconds(10)).until(() -> acks.messages().size() >= 5);
        assertThat(decodedAcks(acks)).extracting(CommandAck::commandSeq, CommandAck::outcome, CommandAck::reason)
                .containsExactly(
                        org.assertj.core.groups.Tuple.tuple(10L, AckOutcome.REJECTED, RefusalReason.BAD_SIGNATURE),
                        org.assertj.core.groups.Tuple.tuple(11L, AckOutcome.REJECTED, RefusalReason.BAD_SIGNATURE),
                        org.assertj.core.groups.Tuple.tuple(12L, AckOutcome.REJECTED, RefusalReason.EXPIRED),
                        org.assertj.core.groups.Tuple.tuple(13L, AckOutcome.REJECTED, RefusalReason.MISSING_SIGNATURE),
                        org.assertj.core.groups.Tuple.tuple(14L, AckOutcome.REJECTED, RefusalReason.UNKNOWN_KEY));
        // nothing refused moved the load reference: wait two scans past the last ack and compare
        int seen = telemetry.messages().size();
        await().atMost(Duration.ofSeconds(5)).until(() -> telemetry.messages().size() >= seen + 2);
        assertThat(lastSetpoint(telemetry)).isEqualTo(startMw);

        UnitCommand good = signer.sign(raise(20, clock.epochMillis(), epoch));
        send(good);
        await().atMost(Duration.ofSeconds(10)).until(() -> acks.messages().size() >= 6);
        assertThat(decodedAcks(acks).get(5).outcome()).isEqualTo(AckOutcome.ACCEPTED);
        // 50 MW/min × 1.2 s = 1.0 MW, moved over the pulse itself
        await().atMost(Duration.ofSeconds(10)).untilAsserted(() ->
                assertThat(lastSetpoint(telemetry)).isCloseTo(startMw + 1.0, within(1e-6)));

        send(good); // the same signed bytes again
        await().atMost(Duration.ofSeconds(10)).until(() -> acks.messages().size() >= 7);
        assertThat(decodedAcks(acks).get(6).reason()).isEqualTo(RefusalReason.REPLAYED);
        int seen2 = telemetry.messages().size();
        await().atMost(Duration.ofSeconds(5)).until(() -> telemetry.messages().size() >= seen2 + 3);
        assertThat(lastSetpoint(telemetry)).isCloseTo(startMw + 1.0, within(1e-6));

        assertThat(unit.refusalCounts()).containsExactlyInAnyOrderEntriesOf(Map.of(RefusalReason.BAD_SIGNATURE, 2L,
                RefusalReason.EXPIRED, 1L, RefusalReason.MISSING_SIGNATURE, 1L, RefusalReason.UNKNOWN_KEY, 1L,
                RefusalReason.REPLAYED, 1L));
        assertThat(unit.acceptedCount()).isEqualTo(1);
        List<PlantJournal.Entry> refused = plant.journal().entries().stream().filter(e -> e.kind().equals("refused"))
                .toList();
        assertThat(refused).extracting(PlantJournal.Entry::commandSeq).containsExactly(10L, 11L, 12L, 13L, 14L, 20L);
        String keyBase64 = java.util.Base64.getEncoder().encodeToString(TestKeys.bytes(UNIT + "." + SecuredSiteFiles.KEY_ID));
        assertThat(refused).allSatisfy(e -> {
            assertThat(e.detail()).doesNotContain(keyBase64).doesNotContain(signed11.signature());
        });
    }

    @Test
    void shouldNotDeliverACommandPublishedByAnotherUnitsIdentity() throws Exception {
        Inbox acks = new Inbox();
        controller.subscribe(topics.unitAck(UNIT), Qos.AT_LEAST_ONCE, acks);
        String other = "ridge-hydro-2";
        try (MqttLink otherUnit = new MqttLink(MqttLinkConfig.builder().serverUri(broker.sslUri()).clientId("intruder")
                .credentials(BrokerAccessModel.unitUser(other), SecureMosquitto.passwordOf(BrokerAccessModel.unitUser(other))
                        .toCharArray())
                .sslSocketFactory(broker.trustedClientFactory("intruder")).build(), clock).start()) {
            assertThat(otherUnit.awaitConnected(10_000)).isTrue();
            UnitCommand validlySigned = new CommandSigner(keys, clock, codec).sign(raise(30, clock.epochMillis(), 1));
            otherUnit.publish(OutboundMessage.of(topics.unitCommand(UNIT), codec.encode(validlySigned), Qos.AT_LEAST_ONCE))
                    .handle((ok, e) -> null).get(10, TimeUnit.SECONDS);
            // a marker from the controller, sent after: once its ack is in, the intruder's would be too
            send(new CommandSigner(keys, clock, codec).sign(UnitCommand.pulse(31, clock.epochMillis(), UNIT, "controller-1",
                    1, clock.epochMillis() + 10_000, PulseDirection.LOWER, 100)));
            await().atMost(Duration.ofSeconds(10)).until(() -> !acks.messages().isEmpty());
            assertThat(decodedAcks(acks)).extracting(CommandAck::commandSeq).containsExactly(31L);
            assertThat(plant.unitCycle(UNIT).unit().acceptedCount()).isEqualTo(1);
        }
    }

    private UnitCommand raise(long seq, long nowMs, long epoch) {
        return UnitCommand.pulse(seq, nowMs, UNIT, "controller-1", epoch, nowMs + 10_000, PulseDirection.RAISE, PULSE_MS);
    }

    private void send(UnitCommand c) throws Exception {
        controller.publish(new OutboundMessage(topics.unitCommand(UNIT), codec.encode(c), Qos.AT_LEAST_ONCE, false, 10))
                .get(10, TimeUnit.SECONDS);
    }

    private List<CommandAck> decodedAcks(Inbox inbox) {
        return inbox.messages().stream().map(m -> codec.decode(m.payload(), CommandAck.class).message().orElseThrow())
                .toList();
    }

    private double lastSetpoint(Inbox telemetry) {
        var ms = telemetry.messages();
        return codec.decode(ms.get(ms.size() - 1).payload(), UnitTelemetry.class).message().orElseThrow().setpointMw();
    }
}
