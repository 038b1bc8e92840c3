package org.loopstand.plant.live;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.InputStreamReader;
import java.io.PrintStream;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.awaitility.Awaitility;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.loopstand.plant.cli.FaultCommand;
import org.loopstand.plant.runtime.PlantCounters;
import org.loopstand.plant.runtime.StepLateness;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.protocol.journal.JournalReader;
import org.loopstand.protocol.message.PulseDirection;
import org.loopstand.protocol.metrics.PrometheusPage;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.WallClock;
import org.loopstand.protocol.topic.TopicTree;
import picocli.CommandLine;

/**
 * The live view's endpoints on a real plant process (child JVM, embedded broker on a free port):
 * /metrics parses as Prometheus text and its counters match the plant journal; a malformed fault from
 * the page gets the CLI's words; a token is enforced; off loopback needs a token.
 */
class LiveViewEndpointTest {
    static final Path SITE = Path.of("..", "config", "sites", "demo-site.yaml");
    static final Pattern ADDRESS = Pattern.compile("live view: (http://127\\.0\\.0\\.1:\\d+/)");
    static final Pattern BROKER = Pattern.compile("broker (tcp://127\\.0\\.0\\.1:\\d+) \\(embedded\\)");

    @TempDir
    Path dir;

    final StringBuffer output = new StringBuffer();
    final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    @Test
    void shouldServeMetricsWhoseCountersMatchThePlantJournal() throws Exception {
        Path scenario = dir.resolve("quiet.yaml");
        Files.writeString(scenario, "site: demo-site\ndurationS: 60\nseed: 7\nevents: []\n");
        Path run = Files.createDirectories(dir.resolve("run"));
        Process plant = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-cp",
                System.getProperty("java.class.path"), "org.loopstand.plant.cli.PlantCli", "plant", "--site", SITE.toString(),
                "--scenario", scenario.toString(), "--rate", "4", "--broker-port", "0", "--live-port", "0",
                "--journal", run.toString(), "--linger-s", "60").redirectErrorStream(true).start();
        Thread pump = new Thread(() -> {
            try (BufferedReader r = new BufferedReader(new InputStreamReader(plant.getInputStream(), StandardCharsets.UTF_8))) {
                for (String l; (l = r.readLine()) != null; ) {
                    output.append(l).append('\n');
                }
            } catch (java.io.IOException e) {
                // the process ended
            }
        });
        pump.setDaemon(true);
        pump.start();
        try {
            Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> output.indexOf("plant: site ") >= 0 || !plant.isAlive());
            String page = find(ADDRESS);
            String broker = find(BROKER);

            // two commands by hand: one expired (refused), one valid for an hour of plant time
            MessageCodec codec = new MessageCodec();
            TopicTree topics = TopicTree.forSite("demo-site");
            MqttLink link = new MqttLink(MqttLinkConfig.builder().serverUri(broker).clientId("endpoint-test").build(),
                    WallClock.INSTANCE).start();
            try {
                assertThat(link.awaitConnected(10_000)).isTrue();
                long now = WallClock.INSTANCE.epochMillis();
                for (UnitCommand c : List.of(UnitCommand.pulse(1, 1_000, "basin-steam-1", "test-ctl", 0, 2_000, PulseDirection.RAISE, 1000),
                        UnitCommand.pulse(2, now, "basin-steam-1", "test-ctl", 0, now + 3_600_000, PulseDirection.RAISE, 1000))) {
                    link.publish(new OutboundMessage(topics.unitCommand("basin-steam-1"), codec.encode(c), Qos.AT_LEAST_ONCE,
                            false, 0)).get(5, TimeUnit.SECONDS);
                }
            } finally {
                link.close();
            }

            // a form posted by some other page in the same browser: no header of ours, refused
            HttpResponse<String> foreign = http.send(HttpRequest.newBuilder(URI.create(page + "api/faults/start"))
                    .header("Content-Type", "application/x-www-form-urlencoded")
                    .POST(HttpRequest.BodyPublishers.ofString("type=blackout&targets=north-basin")).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertThat(foreign.statusCode()).isEqualTo(403);
            assertThat(foreign.body()).startsWith("refused: a fault action must come from the live view's own page");

            // a malformed fault from the page: the CLI's refusal, word for word; then a good one
            HttpResponse<String> bad = post(page + "api/faults/start", "type=drop&targets=north-basin&params=dropProbability%3D2&name=tester");
            assertThat(bad.statusCode()).isEqualTo(400);
            assertThat(bad.body()).isEqualTo(cliRefusal("start", "--type", "drop", "--target", "north-basin",
                    "--param", "dropProbability=2"));
            HttpResponse<String> good = post(page + "api/faults/start",
                    "type=drop&targets=north-basin&params=dropProbability%3D1&durationS=8&orderId=ep-1&name=tester");
            assertThat(good.statusCode()).as(good.body()).isEqualTo(200);

            Awaitility.await().atMost(Duration.ofSeconds(90)).until(() -> output.indexOf("plant: scenario done") >= 0 || !plant.isAlive());
            assertThat(output.toString()).contains("plant: scenario done");
            HttpResponse<String> metrics = http.send(HttpRequest.newBuilder(URI.create(page + "metrics")).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertThat(metrics.headers().firstValue("Content-Type")).contains("text/plain; version=0.0.4; charset=utf-8");
            PrometheusPage m = PrometheusPage.parse(metrics.body());
            List<JournalEntry> journal = JournalReader.readAll(run.resolve("plant.jsonl")).entries();

            for (String kind : List.of("AreaMeter", "UnitTelemetry", "CommandAck")) {
                long sent = journal.stream().filter(published(kind, true)).count();
                assertThat(m.value("loopstand_plant_messages_sent_total", "kind", kind)).as(kind).isEqualTo((double) sent);
            }
            assertThat(m.value("loopstand_plant_messages_sent_total", "kind", "AreaMeter")).isGreaterThan(0);
            Map<String, Long> notSent = new TreeMap<>();
            journal.stream().filter(e -> e.kind().equals("published") && e.get("sent") != null && !e.get("sent").asBoolean())
                    .forEach(e -> notSent.merge(e.text("type") + "/" + e.text("why"), 1L, Long::sum));
            for (PrometheusPage.Sample s : m.samples("loopstand_plant_messages_not_sent_total")) {
                assertThat(s.value()).as(s.labels().toString())
                        .isEqualTo((double) notSent.getOrDefault(s.labels().get("kind") + "/" + s.labels().get("reason"), 0L));
            }
            assertThat(m.samples("loopstand_plant_messages_not_sent_total").stream().mapToDouble(PrometheusPage.Sample::value).sum())
                    .isEqualTo((double) notSent.values().stream().mapToLong(Long::longValue).sum());

            List<JournalEntry> commands = journal.stream().filter(e -> e.kind().equals("command")).toList();
            assertThat(commands).hasSize(2);
            for (String outcome : List.of("accepted", "rejected")) {
                assertThat(m.value("loopstand_plant_commands_total", "kind", "pulse", "outcome", outcome)).as(outcome)
                        .isEqualTo((double) commands.stream().filter(e -> outcome.equals(e.text("outcome"))).count());
            }
            Map<String, Long> reasons = new TreeMap<>();
            commands.stream().filter(e -> e.text("reason") != null).forEach(e -> reasons.merge(e.text("reason"), 1L, Long::sum));
            assertThat(reasons).as("the expired command is refused").isNotEmpty();
            for (var r : reasons.entrySet()) {
                assertThat(m.value("loopstand_plant_command_refusals_total", "reason", r.getKey())).as(r.getKey())
                        .isEqualTo((double) r.getValue());
            }
            assertThat(m.samples("loopstand_plant_command_refusals_total")).hasSize(reasons.size());

            long droppedByFault = journal.stream().filter(e -> e.kind().equals("published") && "dropped".equals(e.text("fate"))
                    && e.text("stream").startsWith("meter/")).count();
            assertThat(droppedByFault).isPositive();
            assertThat(m.value("loopstand_plant_messages_fault_lost_total", "kind", "AreaMeter", "fate", "dropped"))
                    .isEqualTo((double) droppedByFault);

            List<JournalEntry> actions = journal.stream()
                    .filter(e -> e.kind().equals("event") && "liveFaultAction".equals(e.text("event"))).toList();
            assertThat(actions).hasSize(2).allSatisfy(e -> assertThat(e.text("by")).isEqualTo("tester"));
            assertThat(m.value("loopstand_plant_live_fault_actions_total", "action", "start", "result", "refused")).isEqualTo(1);
            assertThat(m.value("loopstand_plant_live_fault_actions_total", "action", "start", "result", "applied")).isEqualTo(1);
            assertThat(m.value("loopstand_plant_scenario_time_seconds")).isEqualTo(60);
            assertThat(m.samples("jvm_memory_used_bytes")).hasSize(2);
        } finally {
            plant.destroy();
            plant.waitFor(30, TimeUnit.SECONDS);
        }
    }

    @Test
    void shouldRefuseRequestsWithoutTheToken() throws Exception {
        String token = "a-token-of-enough-length";
        PlantMetricsPage metrics = new PlantMetricsPage(new PlantCounters(), new StepLateness(1_000_000_000L, s -> { }),
                new LiveFeed(4), null);
        try (LiveServer server = new LiveServer("127.0.0.1", 0, token, "demo-site", new LiveFeed(4), null, metrics, null)) {
            String base = "http://127.0.0.1:" + server.port();
            HttpResponse<String> without = http.send(HttpRequest.newBuilder(URI.create(base + "/metrics")).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertThat(without.statusCode()).isEqualTo(401);
            assertThat(without.body()).startsWith("refused: this live view needs its token");
            HttpResponse<String> wrong = http.send(HttpRequest.newBuilder(URI.create(base + "/?token=not-it")).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertThat(wrong.statusCode()).isEqualTo(401);
            HttpResponse<String> bearer = http.send(HttpRequest.newBuilder(URI.create(base + "/metrics"))
                    .header("Authorization", "Bearer " + token).build(), HttpResponse.BodyHandlers.ofString());
            assertThat(bearer.statusCode()).isEqualTo(200);
            assertThat(PrometheusPage.parse(bearer.body()).types).containsEntry("loopstand_plant_commands_total", "counter");
            HttpResponse<String> query = http.send(HttpRequest.newBuilder(URI.create(base + "/?token=" + token)).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertThat(query.statusCode()).isEqualTo(200);
            assertThat(query.body()).contains("Loopstand live run").doesNotContain("http://", "https://");
            HttpResponse<String> controls = http.send(HttpRequest.newBuilder(URI.create(base + "/api/faults/start?token=" + token))
                    .POST(HttpRequest.BodyPublishers.ofString("type=drop")).build(), HttpResponse.BodyHandlers.ofString());
            assertThat(controls.statusCode()).isEqualTo(403);
        }
    }

    @Test
    void shouldRefuseAnAddressOffLoopbackWithoutAToken() throws Exception {
        assertThatThrownBy(() -> new LiveView.Settings("0.0.0.0", 0, null, true).check())
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessage("--live-bind 0.0.0.0 is off loopback: give --live-token-file FILE so that every request must carry the token");
        Path shortToken = Files.writeString(dir.resolve("token"), "short\n");
        assertThatThrownBy(() -> new LiveView.Settings("127.0.0.1", 0, shortToken, true).check())
                .hasMessageContaining("at least 16 characters, got 5");
        Path goodToken = Files.writeString(dir.resolve("token2"), "0123456789abcdef0123\n");
        assertThat(new LiveView.Settings("0.0.0.0", 0, goodToken, true).check()).isEqualTo("0123456789abcdef0123");
    }

    private static Predicate<JournalEntry> published(String type, boolean sent) {
        return e -> e.kind().equals("published") && type.equals(e.text("type")) && e.get("sent") != null
                && e.get("sent").asBoolean() == sent;
    }

    private HttpResponse<String> post(String url, String form) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(url)).header("Content-Type", "application/x-www-form-urlencoded")
                .header(LiveServer.ACTION_HEADER, "1")
                .POST(HttpRequest.BodyPublishers.ofString(form)).build(), HttpResponse.BodyHandlers.ofString());
    }

    private String find(Pattern p) {
        Matcher m = p.matcher(output);
        assertThat(m.find()).as(output.toString()).isTrue();
        return m.group(1);
    }

    /** What {@code loopstand fault} prints for the same order (it refuses before reaching any broker). */
    static String cliRefusal(String... args) {
        PrintStream err = System.err;
        ByteArrayOutputStream captured = new ByteArrayOutputStream();
        try {
            System.setErr(new PrintStream(captured, true, StandardCharsets.UTF_8));
            assertThat(new CommandLine(new FaultCommand()).execute(args)).isEqualTo(2);
        } finally {
            System.setErr(err);
        }
        return captured.toString(StandardCharsets.UTF_8).strip();
    }
}
