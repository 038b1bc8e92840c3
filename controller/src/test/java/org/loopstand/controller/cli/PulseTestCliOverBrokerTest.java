package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.controller.pulsetest.PulseTestRunner;
import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.physics.StepSizeRule;
import org.loopstand.plant.runtime.ConnectionGrouping;
import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.time.AcceleratedClock;
import org.loopstand.protocol.time.SystemTime;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine;

/**
 * End to end over MQTT: the embedded broker on a free loopback port, the real demo plant on it at 25×
 * (quiet loads, 10:30, accepting the pulse test's controller id) and the {@code pulse-test} command
 * following the plant's clock. About 15 s of wall time.
 */
class PulseTestCliOverBrokerTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final double RATE = 25;

    static LinkFactory mqtt(String uri) {
        return (clientId, will) -> {
            MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(uri).clientId(clientId)
                    .reconnectBackoff(100, 1_000, 0.2);
            if (will != null) {
                b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
            }
            return new MqttLink(b.build(), WallClock.INSTANCE).start();
        };
    }

    /** The demo site's plant at {@link #RATE}× on the broker: loads without noise, 10:30, pulse test accepted. */
    static PlantRunner startQuietDemoPlant(EmbeddedBroker broker) throws Exception {
        String text = Files.readString(SITE).replaceAll("noiseSigmaMw: [0-9.]+", "noiseSigmaMw: 0");
        Grid grid = SiteLoader.load(SITE.toString(), new StringReader(text));
        GridSimulator sim = new GridSimulator(grid, new StepSizeRule(grid).defaultStepS(), 42, 10.5);
        PlantOptions o = new PlantOptions(RATE, Set.of(), ConnectionGrouping.PER_UNIT, 1,
                List.of(MeterSettings.defaults("north-basin"), MeterSettings.defaults("south-ridge")),
                InterfaceOptions.defaults().withTelemetryScanMs(2_000, Map.of()).withAcceptedControllers(
                        Set.of(InterfaceOptions.DEFAULT_CONTROLLER, PulseTestRunner.CONTROLLER_ID)),
                Qos.AT_MOST_ONCE, 256, 7, 5.0);
        AcceleratedClock plantClock = new AcceleratedClock(WallClock.INSTANCE, RATE, SystemTime.wallEpochMillis());
        return new PlantRunner(sim, List.of(), o, mqtt(broker.serverUri()), plantClock, w -> { }).start();
    }

    /** The quick plan's moves only, commands valid 20 s of scenario time (see the test below). */
    static Path quickMovesPlan(Path dir) throws Exception {
        String quick = Files.readString(Path.of("..", "config", "plans", "quick.yaml"));
        String short2 = quick.substring(0, quick.indexOf("  - kind: shortPulses"))
                .replace("commandValidityMs: 3000", "commandValidityMs: 20000");
        return Files.writeString(dir.resolve("quick-moves.yaml"), short2);
    }

    @Test
    void shouldRunTheQuickPlanFromTheCommandLineAndPassTheDemoUnit(@TempDir Path tmp) throws Exception {
        try (EmbeddedBroker broker = new EmbeddedBroker("127.0.0.1", 0).start(Duration.ofSeconds(30));
                PlantRunner plant = startQuietDemoPlant(broker)) {
            // The quick plan's settings and tolerances, its two staircase moves only, and commands valid
            // for 20 s of scenario time: at 25× the shipped 3 s are 120 ms of wall time, less than MQTT
            // delivery plus the clock hand-over take on a busy machine.
            Path plan = quickMovesPlan(tmp);
            PulseTestCommand cmd = new PulseTestCommand();
            cmd.consoleIn = new StringReader("");
            int code = new CommandLine(cmd).execute("--unit", "basin-steam-1", "--site", SITE.toString(),
                    "--broker", broker.serverUri(), "--plan", plan.toString(),
                    "--out", tmp.resolve("runs").toString(), "--follow-plant-clock");

            assertThat(plant.failure()).isNull();
            assertThat(code).isZero(); // 0 = PASS
            Path dir;
            try (Stream<Path> runs = Files.list(tmp.resolve("runs"))) {
                dir = runs.filter(p -> p.getFileName().toString().endsWith("-pulse-test-basin-steam-1"))
                        .findFirst().orElseThrow();
            }
            JsonNode json = new ObjectMapper().readTree(dir.resolve("result.json").toFile());
            assertThat(json.get("verdict").asText()).isEqualTo("pass");
            // same figures as on the in-memory bus (PulseTestOnEmulatorTest): 0.300 MW/pulse-s declared;
            // as measured, the governor gives some back; the unit's own output (its answer removed) is judged
            JsonNode raise = json.get("steps").get(1).get("measuredWithGovernorAnswer");
            assertThat(raise.get("gainMwPerPulseS").asDouble()).isBetween(0.27, 0.30);
            assertThat(json.get("steps").get(1).get("measured").get("gainMwPerPulseS").asDouble())
                    .isCloseTo(0.300, org.assertj.core.api.Assertions.within(0.015));
            assertThat(Files.readString(dir.resolve("report.html"))).contains("id=\"verdict\">PASS")
                    .contains("Unit response");
        }
    }
}
