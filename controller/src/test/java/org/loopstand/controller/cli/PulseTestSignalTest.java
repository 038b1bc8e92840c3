package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.broker.EmbeddedBroker;
import org.loopstand.plant.runtime.PlantRunner;

/**
 * A pulse test stopped by SIGTERM part-way (pulses already sent) still writes its run folder and a CUT
 * SHORT report saying how far the unit was moved and where it was left. The test runs in a child JVM
 * (the real signal path: shutdown hook, then the run folder) against the demo plant at 25× on the embedded
 * broker in this JVM. About 20 s of wall time.
 */
class PulseTestSignalTest {

    @Test
    void shouldWriteACutShortReportWhenStoppedBySigterm(@TempDir Path tmp) throws Exception {
        try (EmbeddedBroker broker = new EmbeddedBroker("127.0.0.1", 0).start(Duration.ofSeconds(30));
                PlantRunner plant = PulseTestCliOverBrokerTest.startQuietDemoPlant(broker)) {
            Path plan = PulseTestCliOverBrokerTest.quickMovesPlan(tmp);
            Path runs = tmp.resolve("runs");
            Process child = new ProcessBuilder(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                    "-Xmx128m", "-cp", System.getProperty("java.class.path"), ControllerCli.class.getName(), "pulse-test",
                    "--unit", "basin-steam-1", "--site", PulseTestCliOverBrokerTest.SITE.toString(),
                    "--broker", broker.serverUri(), "--plan", plan.toString(), "--out", runs.toString(),
                    "--follow-plant-clock"))
                    .redirectErrorStream(true).redirectOutput(tmp.resolve("child.out").toFile()).start();
            try {
                boolean moving = false;
                long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(90);
                while (!moving && child.isAlive() && System.nanoTime() < deadline) {
                    // the raise move is under way and its first pulses are out: a progress line of step 2
                    // with the output requested by the pulses sent
                    moving = Files.readAllLines(tmp.resolve("child.out")).stream()
                            .anyMatch(l -> l.contains("step 2/") && l.contains("requested"));
                    child.waitFor(100, TimeUnit.MILLISECONDS); // polls the child's output, not a timing assertion
                }
                String before = Files.readString(tmp.resolve("child.out"));
                assertThat(moving).as(before).isTrue();
                child.destroy(); // SIGTERM
                assertThat(child.waitFor(60, TimeUnit.SECONDS)).isTrue();
                String seen = Files.readString(tmp.resolve("child.out"));
                assertThat(plant.failure()).isNull();
                Path dir;
                try (Stream<Path> list = Files.list(runs)) {
                    dir = list.filter(p -> p.getFileName().toString().endsWith("-pulse-test-basin-steam-1")).findFirst()
                            .orElseThrow(() -> new AssertionError("no run folder; child said:\n" + seen));
                }
                JsonNode json = new ObjectMapper().readTree(dir.resolve("result.json").toFile());
                assertThat(json.get("verdict").asText()).isEqualTo("aborted");
                assertThat(json.get("stopReason").asText()).contains("signal");
                assertThat(json.get("pulsesSent").asInt()).isPositive();
                // where the unit was left: readings after the pulses, the change asked for by what was sent
                JsonNode moved = json.get("unitMoved");
                assertThat(moved.get("requestedByPulsesSentMw").asDouble()).isPositive();
                assertThat(moved.get("leftAtMw").asDouble() - moved.get("startMw").asDouble())
                        .isEqualTo(moved.get("changeFromStartMw").asDouble());
                assertThat(Files.readAllLines(dir.resolve("telemetry.csv")).size()).isGreaterThan(10);
                String page = Files.readString(dir.resolve("report.html"));
                assertThat(page).contains("id=\"verdict\">CUT SHORT").contains("stopped by a signal")
                        .contains("left at").contains("Loopstand unit response test");
            } finally {
                child.destroyForcibly();
            }
        }
    }
}
