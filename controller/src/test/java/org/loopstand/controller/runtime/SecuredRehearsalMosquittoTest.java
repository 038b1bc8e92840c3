package org.loopstand.controller.runtime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.cli.MqttLinks;
import org.loopstand.plant.cli.PlantSecurity;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.scenario.EventTypeRegistry;
import org.loopstand.plant.scenario.ScenarioLoader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.RefusalReason;
import org.loopstand.protocol.security.CommandSigner;
import org.loopstand.protocol.security.LinkSecurity;
import org.loopstand.protocol.security.broker.BrokerAccessModel;
import org.loopstand.protocol.security.broker.SecureMosquitto;
import org.loopstand.protocol.security.broker.SecuredSiteFiles;
import org.loopstand.protocol.time.WallClock;

/**
 * A secured rehearsal in one JVM: a private Mosquitto from the shipped secure template (password
 * file, generated ACL, mutual TLS), the plant with every unit on its own identity and verifying
 * commands, and the controller logging in as controller-1 and signing every command. A load step
 * makes ACE; the controller regulates, and the units accept its signed commands while refusing
 * none for a signature reason.
 */
class SecuredRehearsalMosquittoTest {
    @TempDir
    Path dir;

    @Test
    void shouldRegulateWithAuthAclTlsAndSignedCommands() throws Exception {
        String site = "secrun" + ProcessHandle.current().pid();
        Path siteFile = Files.writeString(dir.resolve("site.yaml"), Files.readString(Path.of("..", "config", "sites",
                "demo-site.yaml")).replace("siteId: demo-site", "siteId: " + site));
        Path scenarioFile = Files.writeString(dir.resolve("step.yaml"), """
                site: %s
                durationS: 120
                seed: 3
                events:
                  - {atS: 1, type: loadStep, area: south-ridge, deltaMw: 60}
                """.formatted(site));
        Grid grid = SiteLoader.load(siteFile);
        BrokerAccessModel model = PlantSecurity.accessModel(grid, Set.of("controller-1"));
        WallClock clock = WallClock.INSTANCE;
        try (SecureMosquitto broker = SecureMosquitto.start(model, Files.createDirectories(dir.resolve("broker")))) {
            SecuredSiteFiles files = SecuredSiteFiles.write(broker, model,
                    grid.units().stream().map(GeneratingUnit::id).toList(), dir.resolve("files"));
            LinkSecurity plantSecurity = files.multiIdentity("plant").resolve(broker.sslUri(), Map.of());
            LinkSecurity controllerSecurity = files.singleIdentity("controller-1").resolve(broker.sslUri(), Map.of());
            assertThat(plantSecurity.signsCommands()).isTrue();
            assertThat(controllerSecurity.signsCommands()).isTrue();

            PlantOptions o = new PlantOptions(1, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                    grid.areas().stream().map(a -> MeterSettings.defaults(a.id()).withScanPeriodMs(1_000)).toList(),
                    InterfaceOptions.defaults().withTelemetryScanMs(1_000, Map.of()), Qos.AT_MOST_ONCE, 256, 1, 1.0);
            var scenario = ScenarioLoader.load(scenarioFile, EventTypeRegistry.physics(), grid);
            try (PlantRunner plant = new PlantRunner(new GridSimulator(grid, scenario.stepS() > 0 ? scenario.stepS()
                    : new org.loopstand.plant.physics.StepSizeRule(grid).defaultStepS(), scenario.seed(),
                    scenario.startHourOfDay()), scenario.events(), o,
                    MqttLinks.to(broker.sslUri(), clock, plantSecurity, site), clock, s -> { })) {
                PlantSecurity.requireSignedCommands(plantSecurity, plant.unitCycles().stream().map(UnitDutyCycle::unit).toList(), clock);
                plant.start();

                ControllerSiteConfig config = ControllerSiteReader.read(siteFile);
                long epoch = clock.epochMillis();
                var will = OfflineStatus.will(site, "controller-1", epoch, epoch);
                MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(broker.sslUri()).clientId("controller-1")
                        .lastWill(will.topic(), will.payload(), will.qos(), will.retained());
                try (MqttLink bus = new MqttLink(controllerSecurity.applyTo(b, null).build(), clock).start()) {
                    assertThat(bus.awaitConnected(10_000)).isTrue();
                    ControllerAgent agent = new ControllerAgent(config, bus, clock, null, "controller-1", epoch, null, null)
                            .signCommandsWith(new CommandSigner(controllerSecurity.keys().orElseThrow(), clock,
                                    new MessageCodec()));
                    try (AgentRunner runner = new AgentRunner(agent, 1_000_000L).start()) {
                        await().atMost(Duration.ofSeconds(90)).pollInterval(Duration.ofMillis(500))
                                .until(() -> accepted(plant) >= 1 || runner.failure() != null || plant.failure() != null);
                        assertThat(runner.failure()).isNull();
                        assertThat(plant.failure()).isNull();
                    }
                    assertThat(agent.commandsSent()).isGreaterThanOrEqualTo(1);
                    assertThat(agent.unsignableCommands()).isZero();
                }
                assertThat(accepted(plant)).isGreaterThanOrEqualTo(1);
                for (UnitDutyCycle h : plant.unitCycles()) {
                    for (RefusalReason r : List.of(RefusalReason.BAD_SIGNATURE, RefusalReason.MISSING_SIGNATURE,
                            RefusalReason.UNKNOWN_KEY, RefusalReason.REPLAYED)) {
                        assertThat(h.unit().refusalCount(r)).as(h.unit().unitId() + " " + r).isZero();
                    }
                }
            }
        }
    }

    private static long accepted(PlantRunner plant) {
        return plant.unitCycles().stream().mapToLong(h -> h.unit().acceptedCount()).sum();
    }
}
