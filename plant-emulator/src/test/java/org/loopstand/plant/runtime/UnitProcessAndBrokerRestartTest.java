package org.loopstand.plant.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.awaitility.Awaitility.await;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Set;

import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.InboundMessage;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.LinkState;
import org.loopstand.protocol.message.LinkStatus;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.message.UnitStatus;
import org.loopstand.protocol.message.UnitTelemetry;
import org.loopstand.protocol.message.Validity;
import org.loopstand.protocol.testing.Inbox;
import org.loopstand.protocol.testing.MosquittoProcess;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/** Separate-process unit interface killed with SIGKILL, and a Mosquitto restart, on a private broker. */
class UnitProcessAndBrokerRestartTest {
    static final String UNIT = "ridge-hydro-1";
    final MessageCodec codec = new MessageCodec();

    @TempDir
    Path dir;
    MosquittoProcess mosquitto;
    PlantRunner plant;
    MqttLink tester;
    Process unitProcess;

    @AfterEach
    void tearDown() {
        if (unitProcess != null) {
            unitProcess.destroyForcibly();
        }
        if (plant != null) {
            plant.close();
        }
        if (tester != null) {
            tester.close();
        }
        if (mosquitto != null) {
            mosquitto.close();
        }
    }

    PlantRunner plant(Grid grid, Set<String> remote) {
        PlantOptions o = new PlantOptions(1, remote, ConnectionGrouping.PER_UNIT, 1,
                grid.areas().stream().map(a -> MeterSettings.defaults(a.id()).withScanPeriodMs(500)).toList(),
                InterfaceOptions.defaults().withTelemetryScanMs(500, java.util.Map.of()), Qos.AT_MOST_ONCE, 256, 1, 1.0);
        return new PlantRunner(new GridSimulator(grid), List.of(), o, TestSite.mqtt(mosquitto.serverUri()),
                WallClock.INSTANCE, s -> { }).start();
    }

    Process startUnit(Path site) throws Exception {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        return new ProcessBuilder(java, "-cp", System.getProperty("java.class.path"), "org.loopstand.plant.cli.PlantCli",
                "unit", "--site", site.toString(), "--unit", UNIT, "--broker", mosquitto.serverUri(), "--telemetry-scan-ms", "500")
                .redirectErrorStream(true).redirectOutput(dir.resolve("unit-" + System.nanoTime() + ".log").toFile()).start();
    }

    <T> List<T> decoded(Inbox inbox, String topic, Class<T> type) {
        return inbox.messages().stream().filter(m -> m.topic().equals(topic))
                .map(m -> codec.decode(m.payload(), type).message().orElseThrow()).toList();
    }

    <T> T last(List<T> list) {
        return list.get(list.size() - 1);
    }

    @Test
    void shouldHoldTheTurbineWhenTheUnitProcessIsKilledAndResumeWithoutAJump() throws Exception {
        mosquitto = MosquittoProcess.start(dir);
        Path site = TestSite.write(dir);
        Grid grid = TestSite.load(site);
        TopicTree topics = TopicTree.forSite(grid.siteId());
        tester = TestSite.client(mosquitto.serverUri(), "tester");
        Inbox inbox = new Inbox();
        tester.subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, inbox);
        plant = plant(grid, Set.of(UNIT));
        assertThat(plant.unitCycles()).extracting(h -> h.unit().unitId()).doesNotContain(UNIT);

        unitProcess = startUnit(site);
        String telemetry = topics.unitTelemetry(UNIT);
        await().atMost(Duration.ofSeconds(30)).until(() -> decoded(inbox, telemetry, UnitTelemetry.class).stream()
                .anyMatch(t -> t.status() == UnitStatus.ONLINE));
        LinkStatus online = last(decoded(inbox, topics.unitLink(UNIT), LinkStatus.class));
        assertThat(online.state()).isEqualTo(LinkState.ONLINE);
        assertThat(online.clientId()).isEqualTo(grid.siteId() + "-unit-" + UNIT);

        double before = plant.sim().loadReferenceMw(UNIT);
        long now = WallClock.INSTANCE.epochMillis();
        UnitCommand pulse = UnitCommand.pulse(now, now, UNIT, "controller-1", 0, now + 8_000, PulseDirection.RAISE, 1_200);
        tester.publish(OutboundMessage.of(topics.unitCommand(UNIT), codec.encode(pulse), Qos.AT_LEAST_ONCE)).get();
        // 50 MW/min × 1.2 s = 1.0 MW, carried to the physics over the field topics
        await().atMost(Duration.ofSeconds(10)).untilAsserted(() ->
                assertThat(plant.sim().loadReferenceMw(UNIT) - before).isCloseTo(1.0, within(1e-6)));

        unitProcess.destroyForcibly().waitFor(); // SIGKILL: no clean disconnect
        await().atMost(Duration.ofSeconds(10)).until(() ->
                last(decoded(inbox, topics.unitLink(UNIT), LinkStatus.class)).state() == LinkState.OFFLINE);
        double held = plant.sim().loadReferenceMw(UNIT);
        long steps = plant.sim().stepCount();
        int telemetryCount = decoded(inbox, telemetry, UnitTelemetry.class).size();
        await().pollDelay(Duration.ofSeconds(2)).atMost(Duration.ofSeconds(5)).until(() -> true);
        assertThat(plant.sim().stepCount()).isGreaterThan(steps + 50); // the physics ran on
        assertThat(plant.sim().loadReferenceMw(UNIT)).isEqualTo(held);
        assertThat(plant.sim().outputMw(UNIT)).isGreaterThan(0);
        assertThat(decoded(inbox, telemetry, UnitTelemetry.class)).hasSize(telemetryCount);

        unitProcess = startUnit(site);
        // Until its first field reading the restarted interface reports invalid quality (it cannot know the
        // turbine yet); how many such scans there are depends on start-up timing, so judge the good ones.
        await().atMost(Duration.ofSeconds(30)).until(() -> goodAfter(decoded(inbox, telemetry, UnitTelemetry.class), telemetryCount).size() > 2);
        List<UnitTelemetry> restarted = decoded(inbox, telemetry, UnitTelemetry.class).subList(telemetryCount,
                decoded(inbox, telemetry, UnitTelemetry.class).size());
        assertThat(restarted).allSatisfy(t -> assertThat(t.outputQuality().validity() == Validity.GOOD
                || t.status() == UnitStatus.OFFLINE).as("only a unit without a field reading may report non-good").isTrue());
        List<UnitTelemetry> after = goodAfter(restarted, 0).subList(0, 3);
        assertThat(after).allSatisfy(t -> assertThat(t.setpointMw()).isCloseTo(held, within(1e-9)));
        assertThat(plant.sim().loadReferenceMw(UNIT)).isEqualTo(held);
        assertThat(last(decoded(inbox, topics.unitLink(UNIT), LinkStatus.class)).state()).isEqualTo(LinkState.ONLINE);
    }

    @Test
    void shouldBringEveryLinkBackAfterABrokerRestartAndKeepSimulating() throws Exception {
        mosquitto = MosquittoProcess.start(dir);
        Grid grid = TestSite.load(TestSite.write(dir));
        TopicTree topics = TopicTree.forSite(grid.siteId());
        plant = plant(grid, Set.of());
        await().atMost(Duration.ofSeconds(15)).until(() -> plant.buses().stream().allMatch(b -> b.isConnected()));
        await().pollDelay(Duration.ofSeconds(1)).atMost(Duration.ofSeconds(3)).until(() -> true);

        mosquitto.stop();
        long steps = plant.sim().stepCount();
        await().atMost(Duration.ofSeconds(10)).until(() -> plant.buses().stream().noneMatch(b -> b.isConnected()));
        await().atMost(Duration.ofSeconds(10)).until(() -> plant.agent().meterDroppedCount() > 0);
        assertThat(plant.sim().stepCount()).isGreaterThan(steps);
        mosquitto.restart();
        await().atMost(Duration.ofSeconds(30)).until(() -> plant.buses().stream().allMatch(b -> b.isConnected()));

        // no broker persistence: the retained link states exist again only because they were re-announced
        tester = TestSite.client(mosquitto.serverUri(), "tester");
        Inbox inbox = new Inbox();
        tester.subscribe(topics.filterEverything(), Qos.AT_LEAST_ONCE, inbox);
        await().atMost(Duration.ofSeconds(10)).untilAsserted(() -> {
            for (var u : grid.units()) {
                List<LinkStatus> link = decoded(inbox, topics.unitLink(u.id()), LinkStatus.class);
                assertThat(link).as(u.id()).isNotEmpty();
                assertThat(last(link).state()).isEqualTo(LinkState.ONLINE);
            }
            assertThat(inbox.messages().stream().map(InboundMessage::topic)).contains(
                    topics.unitTelemetry("basin-gas-1"), topics.areaMeter("north-basin", "main"));
        });
    }

    private static List<UnitTelemetry> goodAfter(List<UnitTelemetry> all, int from) {
        return all.subList(from, all.size()).stream().filter(t -> t.outputQuality().validity() == Validity.GOOD).toList();
    }
}
