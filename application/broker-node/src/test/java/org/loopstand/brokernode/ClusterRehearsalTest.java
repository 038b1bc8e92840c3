package org.loopstand.brokernode;

import static org.assertj.core.api.Assertions.assertThat;
import static org.awaitility.Awaitility.await;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.testing.FreePort;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The unit-trip rehearsal (demo site, rate 20) with the plant and the controller as two processes on a
 * three-node Artemis cluster on loopback: the plant on n1 (list n1,n2,n3), the controller on n3 (list
 * n3,n1,n2). Before the trip node n1 is stopped, then node n3: each process fails over to the next node
 * of its list and the meters reach the controller across the cluster again; frequency is restored after
 * the trip as on a single broker, and no unit executes a command twice or late.
 */
class ClusterRehearsalTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");
    private static final Path SITE = Path.of("../../config/sites/demo-site.yaml");
    private static final Path SCENARIO = Path.of("../../config/scenarios/cluster-unit-trip.yaml");
    private static final long TRIP_AT_MS = 120_000;
    private static final long KILL_AT_MS = 60_000;
    private static final long SECOND_KILL_AT_MS = 90_000;
    private static final long WATCH_AFTER_TRIP_MS = 400_000;

    private final TopicTree topics = TopicTree.forSite("demo-site");
    private final MessageCodec codec = new MessageCodec();
    private final List<AreaMeter> south = new CopyOnWriteArrayList<>();
    private final List<ClockTick> ticks = new CopyOnWriteArrayList<>();
    private final List<BrokerNode> nodes = new ArrayList<>();
    private MqttLink observer;

    @TempDir
    Path dir;
    private TestProcesses children;

    @AfterEach
    void tearDown() throws Exception {
        children.killAll();
        if (observer != null) {
            observer.close();
        }
        for (BrokerNode n : nodes) {
            n.close();
        }
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void shouldRestoreFrequencyAfterAUnitTripWhenThePlantsNodeStopsBeforeIt() throws Exception {
        children = new TestProcesses(dir);
        int[] mqtt = {FreePort.find(), FreePort.find(), FreePort.find()};
        int[] cluster = {FreePort.find(), FreePort.find(), FreePort.find()};
        for (int i = 0; i < 3; i++) {
            List<String> peers = new ArrayList<>();
            for (int j = 0; j < 3; j++) {
                if (j != i) {
                    peers.add("127.0.0.1:" + cluster[j]);
                }
            }
            nodes.add(BrokerNode.start(new BrokerNodeSettings("n" + (i + 1), "127.0.0.1", mqtt[i], cluster[i], peers,
                    CONFIG, null, null, null, null), dir.resolve("n" + (i + 1))));
        }
        String n1 = "tcp://127.0.0.1:" + mqtt[0];
        String n2 = "tcp://127.0.0.1:" + mqtt[1];
        String n3 = "tcp://127.0.0.1:" + mqtt[2];
        Process plant = launch("plant", "org.loopstand.plant.cli.PlantCli", "plant", "--site", SITE.toString(),
                "--scenario", SCENARIO.toString(), "--rate", "20", "--broker", n1 + "," + n2 + "," + n3,
                "--duration", "90", "--journal", dir.resolve("run").toString());
        Path controllerSite = children.pulsesOnlySite(SITE);
        // a broker list is not a loopback URL to `control`: it asks for --live-plant and the typed site id
        Process controller = launch("controller", "org.loopstand.controller.cli.ControllerCli", "control",
                "--site", controllerSite.toString(), "--broker", n3 + "," + n1 + "," + n2, "--clock", "bus",
                "--journal", dir.resolve("run").toString(), "--live-plant");
        try (var in = controller.getOutputStream()) {
            in.write("demo-site\n".getBytes(java.nio.charset.StandardCharsets.UTF_8));
        }
        observer = new MqttLink(MqttLinkConfig.builder().serverUri(n3 + "," + n1 + "," + n2).clientId("cluster-observer")
                .reconnectBackoff(100, 500, 0.2).build(), WallClock.INSTANCE).start();
        observer.subscribe(topics.areaMeter("south-ridge", "main"), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), AreaMeter.class).message().ifPresent(south::add));
        observer.subscribe(topics.clock(), Qos.AT_MOST_ONCE,
                m -> codec.decode(m.payload(), ClockTick.class).message().ifPresent(ticks::add));
        assertThat(observer.awaitConnected(30_000)).isTrue();
        try {
            awaitScenarioMs(plant, controller, KILL_AT_MS, 60);
            long stoppedAtScenarioMs = lastTick().scenarioTimeMs();
            nodes.get(0).close(); // the plant's node
            awaitScenarioMs(plant, controller, SECOND_KILL_AT_MS, 30);
            long secondStopAtScenarioMs = lastTick().scenarioTimeMs();
            nodes.get(2).close(); // the controller's node (and the observer's: it follows to n1, gone, then n2)
            awaitScenarioMs(plant, controller, TRIP_AT_MS + WATCH_AFTER_TRIP_MS, 80);
            // the plant decides the scenario's checks at its end (600 s, 4 s of wall time on)
            assertThat(plant.waitFor(30, TimeUnit.SECONDS)).as("plant ends with its scenario").isTrue();
            controller.destroy();
            assertThat(controller.waitFor(20, TimeUnit.SECONDS)).isTrue();
            check(stoppedAtScenarioMs, secondStopAtScenarioMs);
        } catch (Throwable t) {
            for (String f : new String[] {"plant.err", "controller.err"}) {
                List<String> lines = Files.readAllLines(dir.resolve(f));
                System.out.println("---- " + f + " (last 30 lines)");
                lines.subList(Math.max(0, lines.size() - 30), lines.size()).forEach(System.out::println);
            }
            throw t;
        }
    }

    private void check(long stoppedAtScenarioMs, long secondStopAtScenarioMs) throws Exception {
        ClockTick tick = lastTick();
        long plantStartMs = tick.sourceTime() - tick.scenarioTimeMs();
        long tripMs = plantStartMs + TRIP_AT_MS;
        long gapFromMs = plantStartMs + stoppedAtScenarioMs;
        double minHz = 99;
        long lastOutsideMs = tripMs;
        long meterGapMs = 0;
        long previousMs = 0;
        for (AreaMeter m : south) {
            if (previousMs > 0 && m.sourceTime() > gapFromMs - 5_000) {
                meterGapMs = Math.max(meterGapMs, m.sourceTime() - previousMs);
            }
            previousMs = m.sourceTime();
            if (m.sourceTime() > tripMs && m.sourceTime() <= tripMs + WATCH_AFTER_TRIP_MS) { // watched as before the checks' wait
                minHz = Math.min(minHz, m.frequencyHz());
                if (Math.abs(m.frequencyHz() - 50) >= 0.05) {
                    lastOutsideMs = m.sourceTime();
                }
            }
        }
        String plantLog = Files.readString(dir.resolve("plant.err"));
        assertThat(plantLog).as("the plant's links moved from n1 to the next node").contains("failed over from");
        assertThat(Files.readString(dir.resolve("controller.err"))).as("the controller moved from n3 to n2")
                .contains("failed over from tcp://127.0.0.1:" + nodes.get(2).settings().mqttPort());
        assertThat(minHz).as("the trip was real").isLessThan(49.85);
        // Commission Regulation (EU) 2017/1485 (SOGL) Annex III, from memory: back inside ±50 mHz within 15 minutes
        assertThat(lastOutsideMs - tripMs).isLessThanOrEqualTo(900_000).isLessThanOrEqualTo(WATCH_AFTER_TRIP_MS - 30_000);

        JournalReader.Contents j = JournalReader.readAll(dir.resolve("run").resolve("controller.jsonl"));
        assertThat(j.summary().damagedLines()).isEmpty();
        List<JournalEntry> sent = of(j, JournalFormat.KIND_SENT);
        List<JournalEntry> received = of(j, JournalFormat.KIND_RECEIVED);
        long expired = of(j, JournalFormat.KIND_REFUSED).stream().filter(e -> "EXPIRED".equals(e.text("reason"))).count();
        long duplicate = of(j, JournalFormat.KIND_REFUSED).stream()
                .filter(e -> "DUPLICATE".equals(e.text("reason"))).count();
        List<JournalEntry> decided = of(j, JournalFormat.KIND_DECIDED);
        long secondGapFromMs = plantStartMs + secondStopAtScenarioMs;
        long reconnects = of(j, JournalFormat.KIND_EVENT).stream()
                .filter(e -> "busReconnected".equals(e.text("event"))).count();
        assertThat(reconnects).as("the controller's journal records its reconnect").isGreaterThanOrEqualTo(1);
        List<String> afterStop = decided.stream().filter(e -> e.tMs() > gapFromMs && e.tMs() < secondGapFromMs + 30_000)
                .map(e -> e.text("state") + (e.get("reasons") == null ? "" : e.get("reasons").toString())).toList();
        long suspendedCycles = afterStop.stream().filter(st -> !st.startsWith("regulating")).count();
        // while its own node is gone the controller says why it holds: the bus link is down (reason code)
        assertThat(afterStop).anySatisfy(st -> assertThat(st).startsWith("suspended").contains("busLinkDown"));
        JournalReader.Contents plantJournal = JournalReader.readAll(dir.resolve("run").resolve("plant.jsonl"));
        assertThat(plantJournal.summary().damagedLines()).isEmpty();
        List<JournalEntry> lastMinute = decided.stream()
                .filter(e -> e.tMs() > tripMs + WATCH_AFTER_TRIP_MS - 60_000 && e.tMs() <= tripMs + WATCH_AFTER_TRIP_MS)
                .toList(); // the plant stops at 600 s: the controller's cycles after that are suspended, rightly
        assertThat(lastMinute).isNotEmpty().allSatisfy(e -> assertThat(e.text("state")).isEqualTo("regulating"));
        assertThat(sent).hasSizeGreaterThan(20);
        assertThat(received.size()).isGreaterThanOrEqualTo((int) (0.9 * sent.size()));
        // after each suspension and each silence of its status (its node stopped), the first commands asked
        // no more of the units than the ACE then called for (noBumpAfterResume, decided by the plant)
        JournalEntry noBump = of(plantJournal, "check").stream().filter(e -> "no-bump".equals(e.text("name"))).findFirst()
                .orElseThrow();
        String resumes = noBump.text("source");
        System.out.println("no-bump " + noBump.get("passed") + ": " + resumes);
        assertThat(noBump.get("passed").asBoolean()).as(resumes).isTrue();
        long resumesAfterStop = java.util.regex.Pattern.compile(" at ([0-9.]+) s after ").matcher(resumes).results()
                .mapToDouble(m -> Double.parseDouble(m.group(1))).filter(atS -> atS > secondStopAtScenarioMs / 1000.0)
                .count();
        assertThat(resumesAfterStop).as("resumes judged after the controller's node stopped: " + resumes).isPositive();
        String figures = String.format(Locale.ROOT, "rehearsal on the cluster: plant's node stopped at %d s, controller's"
                        + " node at %d s of scenario time, controller reconnects %d, longest south meter gap %d ms (scenario), min %.3f Hz, last outside ±50 mHz %d s after"
                        + " the trip, %d cycles (%d not regulating from the first stop to 30 s after the second: %s), %d commands, %d acked, %d refused expired, %d refused"
                        + " duplicate; no-bump %s (%d resumes after the second stop)", stoppedAtScenarioMs / 1000, secondStopAtScenarioMs / 1000, reconnects, meterGapMs, minHz, (lastOutsideMs - tripMs) / 1000,
                decided.size(), suspendedCycles, afterStop.stream().filter(st -> !st.startsWith("regulating")).toList(),
                sent.size(), received.size(), expired, duplicate, noBump.get("passed"), resumesAfterStop);
        System.out.println(figures);
        Files.writeString(Path.of("target", "cluster-rehearsal-figures.txt"), figures + "\n");
    }

    private ClockTick lastTick() {
        return ticks.get(ticks.size() - 1);
    }

    private void awaitScenarioMs(Process plant, Process controller, long scenarioMs, int seconds) {
        await().atMost(Duration.ofSeconds(seconds)).pollInterval(Duration.ofMillis(200)).until(() -> {
            assertThat(plant.isAlive()).as("plant process alive (see plant.err)").isTrue();
            assertThat(controller.isAlive()).as("controller process alive (see controller.err)").isTrue();
            return !ticks.isEmpty() && lastTick().scenarioTimeMs() >= scenarioMs;
        });
    }

    private static List<JournalEntry> of(JournalReader.Contents j, String kind) {
        return j.entries().stream().filter(e -> e.kind().equals(kind)).toList();
    }

    private Process launch(String name, String mainClass, String... args) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("surefire.test.class.path", System.getProperty("java.class.path")),
                mainClass));
        cmd.addAll(List.of(args));
        return children.launch(cmd, name);
    }
}
