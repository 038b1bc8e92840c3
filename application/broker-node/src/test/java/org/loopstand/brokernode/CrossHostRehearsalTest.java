package org.loopstand.brokernode;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.brokernode.hosts.NamespaceHosts;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalFormat;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.security.TestKeys;
import org.loopstand.protocol.security.broker.TestPki;

/**
 * The unit-trip rehearsal (rate 20) across hosts (network namespaces) on the three-node cluster, secured
 * as off loopback it must be: TLS on every node, a login per process, signed commands. Host 1: node n1 and
 * the plant with four units' interfaces (list n1,n2,n3); host 2: node n2 and two units' interfaces as
 * processes of their own, one per area ({@code unit --clock bus --journal}, list n2,n1,n3); host 3: node n3
 * and the controller. Verdict from the journals: the plant's truth (frequency back inside ±50 mHz after the trip)
 * and the controller's (regulating at the end, commands acked, none executed twice). After the trip the
 * scenario cuts the controller's host from the plant's for 80 s ({@code partition}, applied by the plant
 * through a hosts file): see {@link #checkPartition}.
 *
 * <p>The unit processes follow the plant's clock ticks ({@code --clock bus}): a {@code unit} process started
 * with {@code --rate 20} runs its accelerated clock from its own start, so its scenario time trails the
 * plant's by 19 times the gap between the two starts and the controller finds its telemetry too old (seen
 * in a first version of this test: no command went to the units on host 2).
 */
class CrossHostRehearsalTest {
    private static final Path CONFIG = Path.of("../../config/broker/artemis/broker-node.xml");
    private static final Path SITE = Path.of("../../config/sites/demo-site.yaml");
    private static final Path SCENARIO = Path.of("../../config/scenarios/cross-host-partition.yaml");
    private static final List<String> UNITS = List.of("basin-steam-1", "basin-steam-2", "basin-gas-1", "ridge-hydro-1",
            "ridge-hydro-2", "ridge-steam-1");
    /** run as {@code unit} processes on host 2, one per area; the plant runs the others */
    private static final List<String> ELSEWHERE = List.of("basin-gas-1", "ridge-steam-1");
    private static final int MQTT_PORT = 8883;
    private static final long TRIP_AT_MS = 120_000;
    private static final String STORE_PASSWORD = "store-password-0123";
    private NamespaceHosts hosts;

    @TempDir
    Path dir;

    private TestProcesses children;

    @AfterEach
    void tearDown() throws Exception {
        children.killAll();
        if (hosts != null) {
            hosts.close();
        }
        children.keepOutput("cross-host-run", "run/plant.jsonl", "run/controller.jsonl", "run/unit-basin-gas-1.jsonl",
                "run/unit-ridge-steam-1.jsonl");
    }

    @Test
    @Timeout(value = 240, unit = TimeUnit.SECONDS)
    void shouldRestoreFrequencyAfterAUnitTripAndRideOutAPartitionOfTheControllersHost() throws Exception {
        children = new TestProcesses(dir);
        hosts = NetnsHosts.createOrSkip(3);
        TestPki pki = TestPki.newCa("cross-host-ca");
        Path trust = dir.resolve("trust.p12");
        TestPki.writeTrustStore(pki.ca().certificate(), trust, STORE_PASSWORD.toCharArray());
        Path storePassword = Files.writeString(dir.resolve("store.password"), STORE_PASSWORD + "\n");
        StringBuilder users = new StringBuilder();
        StringBuilder keys = new StringBuilder();
        for (String name : names()) {
            users.append(name).append(" = ").append(passwordOf(name)).append('\n');
            Files.writeString(dir.resolve(name + ".password"), passwordOf(name) + "\n");
        }
        for (String u : UNITS) {
            keys.append(u).append(".k1 = ").append(Base64.getEncoder().encodeToString(TestKeys.bytes(u + ".k1")))
                    .append('\n');
        }
        Path usersFile = Files.writeString(dir.resolve("users.properties"), users);
        Path keysFile = Files.writeString(dir.resolve("keys.properties"), keys);
        Path clusterPassword = Files.writeString(dir.resolve("cluster.password"), "cluster-password-0123456789\n");
        for (int i = 1; i <= 3; i++) {
            Path store = dir.resolve("n" + i + ".p12");
            TestPki.writeKeyStore(pki.issueServer("n" + i, hosts.address(i)), store, STORE_PASSWORD.toCharArray());
            List<String> cmd = hosts.java(i, "-Xmx192m", "org.loopstand.brokernode.cli.BrokerNodeCli");
            cmd.addAll(List.of("--name", "n" + i, "--host", hosts.address(i), "--mqtt-port", "" + MQTT_PORT,
                    "--config", CONFIG.toString(), "--users", usersFile.toString(), "--cluster-password-file",
                    clusterPassword.toString(), "--key-store", store.toString(), "--key-store-password-file",
                    storePassword.toString(), "--work-dir", dir.resolve("n" + i).toString()));
            for (int j = 1; j <= 3; j++) {
                if (j != i) {
                    cmd.addAll(List.of("--peer", hosts.address(j) + ":61616"));
                }
            }
            launch(cmd, "n" + i);
        }
        for (int i = 1; i <= 3; i++) {
            awaitStarted(dir.resolve("n" + i + ".out"), "broker node n" + i + " listening", 40_000);
        }
        List<String> tls = List.of("--keys", keysFile.toString(), "--trust-store", trust.toString(),
                "--trust-store-password-file", storePassword.toString());
        Path run = dir.resolve("run");
        List<String> plant = hosts.java(1, "-Xmx512m", "org.loopstand.plant.cli.PlantCli");
        Path hostsFile = hosts.writeHostsFile(dir.resolve("hosts.yaml"), List.of("plant-host", "unit-host", "control-host"),
                1, 3, 3);
        // --wait-go: scenario time starts once every part is connected (below), as a rehearsal starts it; a unit
        // process that connects seconds late on a busy machine would otherwise meet its watchdog before the partition
        plant.addAll(List.of("plant", "--site", SITE.toString(), "--scenario", SCENARIO.toString(), "--rate", "20",
                "--wait-go", "--broker", list(1, 2, 3), "--duration", "110", "--journal", run.toString(), "--credentials-file",
                usersFile.toString(), "--hosts", hostsFile.toString(), "--units",
                String.join(",", UNITS.stream().filter(u -> !ELSEWHERE.contains(u)).toList())));
        plant.addAll(tls);
        Process plantProcess = launch(plant, "plant");
        awaitStarted(dir.resolve("plant.out"), "plant: site demo-site", 40_000); // connected, scenario time held at 0
        List<Process> unitProcesses = new ArrayList<>();
        for (String u : ELSEWHERE) {
            List<String> unit = hosts.java(2, "-Xmx128m", "org.loopstand.plant.cli.PlantCli");
            unit.addAll(List.of("unit", "--site", SITE.toString(), "--unit", u, "--broker", list(2, 1, 3), "--clock", "bus",
                    "--journal", run.toString(), "--username", "unit-" + u, "--password-file",
                    dir.resolve("unit-" + u + ".password").toString()));
            unit.addAll(tls);
            unitProcesses.add(launch(unit, "unit-" + u));
        }
        Path controllerSite = children.pulsesOnlySite(SITE);
        List<String> control = hosts.java(3, "-Xmx256m", "org.loopstand.controller.cli.ControllerCli");
        control.addAll(List.of("control", "--site", controllerSite.toString(), "--broker",
                "ssl://" + hosts.address(3) + ":" + MQTT_PORT, "--clock", "bus", "--journal", run.toString(),
                "--live-plant", "--username", "controller-1", "--password-file",
                dir.resolve("controller-1.password").toString()));
        control.addAll(tls);
        Process controller = launch(control, "controller");
        try (OutputStream in = controller.getOutputStream()) {
            in.write("demo-site\n".getBytes(StandardCharsets.UTF_8)); // the typed confirmation off loopback
        }
        for (String u : ELSEWHERE) {
            awaitStarted(dir.resolve("unit-" + u + ".err"), ": connected to ", 60_000);
        }
        awaitStarted(dir.resolve("controller.err"), ": connected to ", 60_000);
        OutputStream plantIn = plantProcess.getOutputStream();
        plantIn.write("go\n".getBytes(StandardCharsets.UTF_8));
        plantIn.flush(); // left open: the plant reads no more after the go

        // the plant ends with its scenario (45 s of wall time at rate 20); --duration only caps a plant that cannot keep
        // the rate: it must reach the end, where it decides the scenario's checks. Its pace keeper slows the clock for
        // old commands on a loaded machine (kept 12.5x in one CI run: 70 s of wall time ended it at 873 s of 900)
        assertThat(plantProcess.waitFor(125, TimeUnit.SECONDS)).as("plant ends with its scenario").isTrue();
        controller.destroy();
        assertThat(controller.waitFor(20, TimeUnit.SECONDS)).isTrue();
        for (Process u : unitProcesses) {
            assertThat(u.isAlive()).as("unit process still running at the end").isTrue();
            u.destroy(); // SIGTERM: its shutdown hook closes its journal
            assertThat(u.waitFor(20, TimeUnit.SECONDS)).isTrue();
        }
        check(run);
    }

    private void check(Path run) throws IOException {
        JournalReader.Contents plant = JournalReader.readAll(run.resolve("plant.jsonl"));
        assertThat(plant.summary().damagedLines()).isEmpty();
        List<JournalEntry> truth = plant.entries().stream().filter(e -> e.kind().equals(JournalFormat.KIND_TRUTH))
                .toList();
        long startMs = truth.get(0).tMs() - (long) (truth.get(0).get("timeS").asDouble() * 1000);
        long tripMs = startMs + TRIP_AT_MS;
        double minHz = 99;
        long lastOutsideMs = tripMs;
        long lastMs = truth.get(truth.size() - 1).tMs();
        double endDeviationHz = 0;
        int endSamples = 0;
        for (JournalEntry e : truth) {
            double hz = e.get("areas").get("south-ridge").get("frequencyHz").asDouble();
            if (e.tMs() > tripMs) {
                minHz = Math.min(minHz, hz);
                lastOutsideMs = Math.abs(hz - 50) >= 0.05 ? e.tMs() : lastOutsideMs;
            }
            if (e.tMs() > lastMs - 30_000) {
                endDeviationHz += Math.abs(hz - 50);
                endSamples++;
            }
        }
        endDeviationHz /= Math.max(1, endSamples);
        JournalReader.Contents j = JournalReader.readAll(run.resolve("controller.jsonl"));
        assertThat(j.summary().damagedLines()).isEmpty();
        List<JournalEntry> sent = of(j, JournalFormat.KIND_SENT);
        List<JournalEntry> acked = of(j, JournalFormat.KIND_RECEIVED);
        long expired = of(j, JournalFormat.KIND_REFUSED).stream().filter(e -> "EXPIRED".equals(e.text("reason"))).count();
        List<JournalEntry> decided = of(j, JournalFormat.KIND_DECIDED);
        long duplicate = of(j, JournalFormat.KIND_REFUSED).stream()
                .filter(e -> "DUPLICATE".equals(e.text("reason"))).count();
        String figures = String.format(Locale.ROOT, "cross-host rehearsal: min %.3f Hz, mean |Δf| over the last 30 s"
                        + " %.1f mHz, last outside ±50 mHz %d s after the trip (watched %d s), %d cycles, %d commands"
                        + ", %d acked, %d refused expired, %d refused duplicate", minHz,
                endDeviationHz * 1000, (lastOutsideMs - tripMs) / 1000, (lastMs - tripMs) / 1000, decided.size(),
                sent.size(), acked.size(), expired, duplicate);
        System.out.println(figures);
        Files.writeString(Path.of("target", "cross-host-figures.txt"), figures + "\n");
        assertThat(minHz).as("the trip was real").isLessThan(49.85);
        // Commission Regulation (EU) 2017/1485 (SOGL) Annex III, from memory: back inside ±50 mHz within 15
        // minutes, and stays there for the last 30 s watched
        assertThat(lastOutsideMs - tripMs).isLessThanOrEqualTo(900_000).isLessThan(lastMs - tripMs - 30_000);
        assertThat(endDeviationHz).isLessThan(0.05);
        assertThat(duplicate).isZero();
        assertThat(sent).hasSizeGreaterThan(20);
        assertThat(acked.size()).isGreaterThanOrEqualTo((int) (0.9 * sent.size()));
        // the plant stops first (--duration): the controller's cycles after that are suspended, rightly
        List<JournalEntry> lastMinute = decided.stream().filter(e -> e.tMs() > lastMs - 60_000 && e.tMs() < lastMs)
                .toList();
        assertThat(lastMinute).isNotEmpty().allSatisfy(e -> assertThat(e.text("state")).isEqualTo("regulating"));
        checkPartition(plant, j, run);
    }

    /**
     * The scripted partition (control-host cut from plant-host, 560–640 s): journaled with its link, the
     * units fell back per their watchdog while it lasted, the controller suspended, and after the heal it
     * regulated again and the units (returned to remote at 730 s) took its commands; its first commands
     * after each resume did not bump the units (the plant's noBumpAfterResume verdict).
     */
    private void checkPartition(JournalReader.Contents plant, JournalReader.Contents controller, Path run)
            throws IOException {
        List<JournalEntry> networkFaults = of(plant, "networkFault");
        String link = "[\"" + hosts.hub() + "/" + hosts.hubSide(3) + "\"] 80.0";
        assertThat(networkFaults.stream().map(e -> e.text("action") + " " + e.get("links") + " " + e.get("windowS")))
                .containsExactly("partition " + link, "partitionLifted " + link);
        long cutMs = networkFaults.get(0).tMs();
        long healMs = networkFaults.get(1).tMs();
        List<JournalEntry> events = new ArrayList<>(of(plant, JournalFormat.KIND_EVENT));
        List<JournalEntry> unitEntries = new ArrayList<>(plant.entries());
        for (String u : ELSEWHERE) { // the unit processes on host 2 journal their own decisions
            JournalReader.Contents unit = JournalReader.readAll(run.resolve("unit-" + u + ".jsonl"));
            unitEntries.addAll(unit.entries());
            assertThat(unit.summary().damagedLines()).isEmpty();
            assertThat(of(unit, "command")).as(u + " took commands from the controller across the cluster")
                    .anySatisfy(e -> assertThat(e.text("outcome")).isEqualTo("accepted"));
            events.addAll(of(unit, JournalFormat.KIND_EVENT));
        }
        List<JournalEntry> fellBack = events.stream()
                .filter(e -> "watchdog".equals(e.text("event")) && e.tMs() > cutMs && e.tMs() < healMs).toList();
        // the demo site's units: 30 s watchdog (site file), so each left remote inside the 80 s cut, on host 1
        // and on host 2 alike
        assertThat(fellBack.stream().map(e -> e.text("unit")).distinct())
                .as(() -> "units that fell back on their watchdog inside the cut; the others' decisions, s from the cut:"
                        + notFallenBack(fellBack, unitEntries, cutMs))
                .hasSize(UNITS.size() - 1) // ridge-hydro-2 tripped
                .containsAll(ELSEWHERE);
        List<JournalEntry> decided = of(controller, JournalFormat.KIND_DECIDED);
        // blind during the cut, the controller extrapolates the plant's clock at the last tick's rate; a plant
        // that slowed its pace meanwhile (a loaded machine) is found far behind after the heal and followed back
        long clockBackMs = 0;
        for (int i = 1; i < decided.size(); i++) {
            clockBackMs = Math.max(clockBackMs, decided.get(i - 1).tMs() - decided.get(i).tMs());
        }
        List<JournalEntry> cut = decided.stream().filter(e -> e.tMs() > cutMs && e.tMs() < healMs).toList();
        assertThat(cut).as("the controller's cycles while cut off").anySatisfy(e -> assertThat(e.text("state"))
                .isEqualTo("suspended"));
        long resumedMs = decided.stream().filter(e -> e.tMs() > healMs && "regulating".equals(e.text("state")))
                .mapToLong(JournalEntry::tMs).min().orElseThrow();
        long remoteAgainMs = of(plant, JournalFormat.KIND_EVENT).stream().filter(e -> "mode".equals(e.text("event"))
                && e.tMs() > healMs && e.text("detail").startsWith("local -> remote")).mapToLong(JournalEntry::tMs).min()
                .orElseThrow();
        long ackedAfterRemote = of(controller, JournalFormat.KIND_RECEIVED).stream().filter(e -> e.tMs() > remoteAgainMs)
                .count();
        assertThat(ackedAfterRemote).as("commands acked after the units were back in remote").isPositive();
        JournalEntry noBump = of(plant, "check").stream().filter(e -> "no-bump".equals(e.text("name"))).findFirst()
                .orElseThrow(() -> new AssertionError("the plant decided no no-bump check: "
                        + of(plant, JournalFormat.KIND_EVENT).stream().filter(e -> "checksNotDecided".equals(e.text("event")))
                        .map(e -> "stopped before the scenario's end at " + e.get("stoppedAtS") + " s").findFirst()
                        .orElse("no checksNotDecided event either")));
        String figures = String.format(Locale.ROOT, "partition (560–640 s scenario): %d units fell back (first %d s after the cut),"
                        + " %d of %d controller cycles suspended while cut, regulating again %d s after the heal, %d commands"
                        + " acked after the units' return to remote, controller clock set back by up to %d s; no-bump %s: %s",
                fellBack.stream().map(e -> e.text("unit"))
                        .distinct().count(), (fellBack.get(0).tMs() - cutMs) / 1000,
                cut.stream().filter(e -> "suspended".equals(e.text("state"))).count(), cut.size(), (resumedMs - healMs) / 1000,
                ackedAfterRemote, clockBackMs / 1000, noBump.get("passed"), noBump.text("source"));
        System.out.println(figures);
        Files.writeString(Path.of("target", "cross-host-figures.txt"), figures + "\n", java.nio.file.StandardOpenOption.APPEND);
        assertThat(noBump.get("passed").asBoolean()).as(noBump.text("source")).isTrue();
        assertThat(noBump.text("source")).as("a resume from the suspension on stale data was judged")
                .contains("after suspended [frequencyUnusable:");
    }

    /** What each unit that did not fall back inside the cut decided about its mode and the controller's statuses. */
    private static String notFallenBack(List<JournalEntry> fellBack, List<JournalEntry> entries, long cutMs) {
        StringBuilder why = new StringBuilder();
        for (String u : UNITS) {
            if (fellBack.stream().anyMatch(e -> u.equals(e.text("unit")))) {
                continue;
            }
            why.append("\n  ").append(u).append(':');
            List<JournalEntry> mine = entries.stream().filter(e -> u.equals(e.text("unit"))).toList();
            mine.stream().filter(e -> !List.of("command", "telemetry", "published").contains(e.kind()))
                    .forEach(e -> why.append(String.format(Locale.ROOT, "\n    %+.1f %s %s %s %s", (e.tMs() - cutMs) / 1000.0,
                            e.kind(), e.text("event"), e.text("code"), e.text("detail"))));
            mine.stream().filter(e -> e.kind().equals("command") && e.tMs() < cutMs).reduce((a, b) -> b)
                    .ifPresent(e -> why.append(String.format(Locale.ROOT, "\n    last command before the cut at %+.1f: %s",
                            (e.tMs() - cutMs) / 1000.0, e.text("outcome"))));
            why.append("\n    commands after the cut: ").append(mine.stream()
                    .filter(e -> e.kind().equals("command") && e.tMs() >= cutMs).count());
        }
        return why.toString();
    }

    private static List<String> names() {
        List<String> names = new ArrayList<>(List.of("plant", "controller-1"));
        UNITS.forEach(u -> names.add("unit-" + u));
        return names;
    }

    private static String passwordOf(String name) {
        return "pw-" + name + "-0123456789";
    }

    private String list(int... order) {
        List<String> uris = new ArrayList<>();
        for (int i : order) {
            uris.add("ssl://" + hosts.address(i) + ":" + MQTT_PORT);
        }
        return String.join(",", uris);
    }

    private static List<JournalEntry> of(JournalReader.Contents j, String kind) {
        return j.entries().stream().filter(e -> e.kind().equals(kind)).toList();
    }

    private Process launch(List<String> cmd, String name) throws IOException {
        return children.launch(cmd, name);
    }

    private static void awaitStarted(Path out, String line, long timeoutMs) throws Exception {
        for (long waitedMs = 0; waitedMs < timeoutMs; waitedMs += 100) {
            if (Files.exists(out) && Files.readString(out).contains(line)) {
                return;
            }
            Thread.sleep(100);
        }
        throw new AssertionError("'" + line + "' not seen in " + out + " within " + timeoutMs + " ms");
    }
}
