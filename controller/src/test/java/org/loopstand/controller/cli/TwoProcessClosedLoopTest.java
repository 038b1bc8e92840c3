package org.loopstand.controller.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.EndReason;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.testing.FreePort;
import org.loopstand.protocol.testing.MosquittoProcess;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * Issue 4 "done when": the plant ({@code PlantCli plant}) and the controller ({@code ControllerCli
 * control --clock bus}) as two JVMs on a real broker, the demo site with the shipped unit-trip scenario
 * at rate 20 (ridge-hydro-2, 260 MW, trips at 120 s of scenario time). The test watches the south's
 * meter and the plant's clock over its own MQTT link and reads the controller's journal afterwards.
 */
class TwoProcessClosedLoopTest {
    private static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    private static final Path SCENARIO = Path.of("..", "config", "scenarios", "unit-trip.yaml");
    private static final double RATE = 20;
    private static final long TRIP_AT_MS = 120_000;
    /**
     * how long after the trip the run is watched, scenario ms (23 s of wall time at rate 20); ends
     * before the scenario's 600 s, when the plant stops by itself
     */
    private static final long WATCH_AFTER_TRIP_MS = 460_000;
    /** stated bound for the return inside ±50 mHz; the study test takes 228 s */
    private static final long RESTORE_BOUND_MS = 420_000;

    private final TopicTree topics = TopicTree.forSite("demo-site");
    private final MessageCodec codec = new MessageCodec();
    private final List<AreaMeter> south = new CopyOnWriteArrayList<>();
    private final List<ClockTick> ticks = new CopyOnWriteArrayList<>();
    private final List<Process> processes = new ArrayList<>();
    private MqttLink observer;

    @AfterEach
    void stopEverything() throws Exception {
        for (Process p : processes) {
            if (p.isAlive()) {
                p.destroy();
                if (!p.waitFor(10, TimeUnit.SECONDS)) {
                    p.destroyForcibly();
                }
            }
        }
        if (observer != null) {
            observer.close();
        }
    }

    @Test
    @Timeout(value = 200, unit = TimeUnit.SECONDS)
    void shouldRestoreFrequencyByPulsesAcrossTwoProcessesOverTheEmbeddedBroker(@TempDir Path dir) throws Exception {
        int port = FreePort.find();
        Process plant = launch(dir, "plant", "org.loopstand.plant.cli.PlantCli", "plant", "--site", SITE.toString(),
                "--scenario", SCENARIO.toString(), "--rate", fmt(RATE), "--broker-port", Integer.toString(port),
                "--duration", "160");
        String uri = "tcp://127.0.0.1:" + port;
        runControllerAndCheck(dir, uri, plant);
    }

    @Test
    @Timeout(value = 200, unit = TimeUnit.SECONDS)
    void shouldRestoreFrequencyByPulsesAcrossTwoProcessesOverAPrivateMosquitto(@TempDir Path dir) throws Exception {
        Assumptions.assumeTrue(Files.isExecutable(MosquittoProcess.BINARY), "mosquitto is not installed");
        try (MosquittoProcess mosquitto = MosquittoProcess.start(dir)) {
            Process plant = launch(dir, "plant", "org.loopstand.plant.cli.PlantCli", "plant", "--site", SITE.toString(),
                    "--scenario", SCENARIO.toString(), "--rate", fmt(RATE), "--broker", mosquitto.serverUri(),
                    "--duration", "160");
            runControllerAndCheck(dir, mosquitto.serverUri(), plant);
        }
    }

    private void runControllerAndCheck(Path dir, String uri, Process plant) throws Exception {
        try {
            watch(dir, uri, plant);
        } catch (Throwable t) {
            for (String f : new String[] {"plant.out", "plant.err", "controller.out", "controller.err"}) {
                Path file = dir.resolve(f);
                if (Files.exists(file)) {
                    List<String> lines = Files.readAllLines(file);
                    System.out.println("---- " + f + " (last 30 lines)");
                    lines.subList(Math.max(0, lines.size() - 30), lines.size()).forEach(System.out::println);
                }
            }
            throw t;
        }
    }

    private void watch(Path dir, String uri, Process plant) throws Exception {
        Path journalDir = dir.resolve("run");
        // the controller's copy of the site asks for pulses only (most demo units also take setpoints)
        Path controllerSite = dir.resolve("demo-site-pulses.yaml");
        String siteText = Files.readString(SITE);
        String pulsesOnly = "  pulses: {preferSetpoints: false}\n";
        assertThat(siteText).doesNotContain("\n  pulses:");
        Files.writeString(controllerSite, siteText.contains("\ncontroller:\n")
                ? siteText.replace("\ncontroller:\n", "\ncontroller:\n" + pulsesOnly)
                : siteText + "\ncontroller:\n" + pulsesOnly);
        Process controller = launch(dir, "controller", "org.loopstand.controller.cli.ControllerCli", "control",
                "--site", controllerSite.toString(), "--broker", uri, "--clock", "bus", "--journal", journalDir.toString());
        observer = new MqttLink(MqttLinkConfig.builder().serverUri(uri).clientId("two-process-observer")
                .reconnectBackoff(100, 500, 0.2).build(), WallClock.INSTANCE).start();
        observer.subscribe(topics.areaMeter("south-ridge", "main"), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), AreaMeter.class).message().ifPresent(south::add));
        observer.subscribe(topics.clock(), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), ClockTick.class).message().ifPresent(ticks::add));
        assertThat(observer.awaitConnected(30_000)).as("observer connected to " + uri).isTrue();

        // 580 s of scenario time at rate 20 are 29 s of wall time; a busy machine makes the plant's pace keeper
        // slow the clock (journaled, the rate is a speed), so the watch allows five times that
        await().atMost(Duration.ofSeconds(150)).pollInterval(Duration.ofMillis(250)).until(() -> {
            assertThat(plant.isAlive()).as("plant process alive (see plant.err)").isTrue();
            assertThat(controller.isAlive()).as("controller process alive (see controller.err)").isTrue();
            return !ticks.isEmpty() && ticks.get(ticks.size() - 1).scenarioTimeMs() >= TRIP_AT_MS + WATCH_AFTER_TRIP_MS;
        });
        controller.destroy(); // SIGTERM: the shutdown hook closes the agent and its journal cleanly
        assertThat(controller.waitFor(20, TimeUnit.SECONDS)).isTrue();

        // the plant's scenario epoch: a tick's source time minus its scenario time
        ClockTick tick = ticks.get(ticks.size() - 1);
        long plantStartMs = tick.sourceTime() - tick.scenarioTimeMs();
        long tripMs = plantStartMs + TRIP_AT_MS;
        // the asked rate, or lower where the pace keeper slowed the clock for a busy machine (never faster)
        assertThat(tick.rate()).isPositive().isLessThanOrEqualTo(RATE);

        double minHz = 99;
        long lastOutsideMs = tripMs;
        long lastReadingMs = 0;
        for (AreaMeter m : south) {
            if (m.sourceTime() > tripMs) {
                minHz = Math.min(minHz, m.frequencyHz());
                if (Math.abs(m.frequencyHz() - 50) >= 0.05) {
                    lastOutsideMs = m.sourceTime();
                }
                lastReadingMs = Math.max(lastReadingMs, m.sourceTime());
            }
        }
        // the trip was real and large: the south went well outside the standard range
        assertThat(minHz).isLessThan(49.85);
        // Commission Regulation (EU) 2017/1485 (SOGL) Annex III, from memory: back inside ±50 mHz within 15 minutes, and stays
        assertThat(lastOutsideMs - tripMs).isLessThanOrEqualTo(900_000).isLessThanOrEqualTo(RESTORE_BOUND_MS);
        assertThat(lastReadingMs - tripMs).isGreaterThanOrEqualTo(WATCH_AFTER_TRIP_MS - 10_000);

        JournalReader.Contents j = JournalReader.readAll(journalDir.resolve("controller.jsonl"));
        assertThat(j.summary().damagedLines()).isEmpty();
        assertThat(j.summary().endReason()).contains(EndReason.STOPPED);
        List<JournalEntry> decided = of(j, JournalFormat.KIND_DECIDED);
        List<JournalEntry> sent = of(j, JournalFormat.KIND_SENT);
        List<JournalEntry> received = of(j, JournalFormat.KIND_RECEIVED);
        long expired = of(j, JournalFormat.KIND_REFUSED).stream().filter(e -> "EXPIRED".equals(e.text("reason"))).count();
        // --clock bus: cycles are stamped in the plant's scenario time, about 4 s apart, and cover the
        // whole watch (with a wall clock they would span only the ~30 s the run took). At rate 20 one
        // wall millisecond of start jitter is 20 ms of scenario time, so the spacing is not exact.
        assertThat(decided.get(decided.size() - 1).tMs() - plantStartMs).isGreaterThan(TRIP_AT_MS + WATCH_AFTER_TRIP_MS - 20_000);
        List<Long> spacingMs = new ArrayList<>();
        for (int i = 1; i < decided.size(); i++) {
            spacingMs.add(decided.get(i).tMs() - decided.get(i - 1).tMs());
        }
        spacingMs.sort(null);
        long medianSpacingMs = spacingMs.get(spacingMs.size() / 2);
        assertThat(medianSpacingMs).isBetween(3_800L, 4_200L);
        assertThat(spacingMs.stream().filter(d -> Math.abs(d - 4_000) <= 1_000).count())
                .isGreaterThan((long) (0.8 * spacingMs.size()));
        // pulses and setpoints went out and the units acknowledged them
        assertThat(sent).hasSizeGreaterThan(20);
        assertThat(sent).allSatisfy(e -> assertThat(e.text("commandKind")).isEqualTo("pulse"));
        assertThat(received.size()).isGreaterThanOrEqualTo((int) (0.95 * sent.size()));
        assertThat(expired).isLessThanOrEqualTo(sent.size() / 20);
        // after the trip no area ran out of eligible units, and at the end the south's ACE is small
        List<JournalEntry> afterTrip = decided.stream().filter(e -> e.tMs() > tripMs).toList();
        assertThat(afterTrip).allSatisfy(e -> assertThat(e.get("notes").toString()).doesNotContain("noEligibleUnits")
                .doesNotContain("notFollowing"));
        List<JournalEntry> lastMinute = decided.stream()
                .filter(e -> e.tMs() > tripMs + WATCH_AFTER_TRIP_MS - 60_000).toList();
        assertThat(lastMinute).isNotEmpty().allSatisfy(e -> {
            assertThat(e.text("state")).isEqualTo("regulating");
            assertThat(Math.abs(southAce(e))).isLessThan(30);
        });
        System.out.printf(Locale.ROOT, "two processes over %s: min %.3f Hz, last outside ±50 mHz %d s after the trip,"
                        + " %d cycles (median spacing %d ms), %d commands, %d acked, %d expired%n", uri, minHz,
                (lastOutsideMs - tripMs) / 1000, decided.size(), medianSpacingMs, sent.size(), received.size(), expired);
    }

    private static double southAce(JournalEntry e) {
        for (JsonNode a : e.get("areas")) {
            if (a.get("area").asText().equals("south-ridge")) {
                return a.get("aceMw").asDouble();
            }
        }
        throw new AssertionError("no south-ridge ACE in " + e.fields());
    }

    private static List<JournalEntry> of(JournalReader.Contents j, String kind) {
        return j.entries().stream().filter(e -> e.kind().equals(kind)).toList();
    }

    private Process launch(Path dir, String name, String mainClass, String... args) throws Exception {
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.add("-cp");
        cmd.add(System.getProperty("java.class.path"));
        cmd.add(mainClass);
        cmd.addAll(List.of(args));
        Process p = new ProcessBuilder(cmd).redirectOutput(dir.resolve(name + ".out").toFile())
                .redirectError(dir.resolve(name + ".err").toFile()).start();
        processes.add(p);
        return p;
    }

    private static String fmt(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }
}
