package example;

import java.io.File;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;

/**
 * A minimal secondary frequency controller written against docs/controller-contract.md only: Paho
 * MQTT v5 and Jackson, none of the rig's own code. Every 4 s of scenario time it computes each area's
 * tie-line bias ACE from the latest meter reading and the area's schedule, and sends raise/lower pulses
 * to the area's units in remote, shared equally. It suspends an area whose meter is stale and stops
 * when the plant announces the end of the run. A demonstration of the contract, not a controller to
 * put in front of a real plant.
 */
public final class MinimalController implements MqttCallback {
    static final long CYCLE_MS = 4_000;
    static final long STALE_MS = 6_000;
    static final double DEAD_BAND_MW = 5;
    static final double GAIN_PER_CYCLE = 0.3;
    static final long MAX_PULSE_MS = 3_000;

    private final ObjectMapper json = new ObjectMapper();
    private final String root;
    private final String id;
    private final long epoch;
    private final Map<String, Double> betaMwPerHz = new ConcurrentHashMap<>();
    private final Map<String, String> unitArea = new ConcurrentHashMap<>();
    private final Map<String, JsonNode> meters = new ConcurrentHashMap<>();
    private final Map<String, JsonNode> schedules = new ConcurrentHashMap<>();
    private final Map<String, JsonNode> telemetry = new ConcurrentHashMap<>();
    private final Map<String, Double> siteScheduledNiMw = new ConcurrentHashMap<>();
    private final Map<String, Double> nominalHz = new ConcurrentHashMap<>();
    private volatile long tickScenarioEpochMs = -1;
    private volatile long tickWallNanos;
    private volatile double rate = 1;
    private volatile boolean running;
    private volatile boolean ended;
    private MqttClient client;
    private long seq = 1;
    private long cycle;

    MinimalController(String root, String id, JsonNode site) {
        this.root = root;
        this.id = id;
        this.epoch = System.currentTimeMillis();
        for (JsonNode a : site.path("areas")) {
            String area = a.path("id").asText();
            // β in MW/Hz, positive: K for the European convention, −10·B for the North-American one
            double beta = a.has("kMwPerHz") ? a.path("kMwPerHz").asDouble() : -10 * a.path("biasMwPer01Hz").asDouble();
            betaMwPerHz.put(area, beta);
            nominalHz.put(area, a.path("nominalFrequencyHz").asDouble(50));
            siteScheduledNiMw.put(area, 0.0);
        }
        for (JsonNode t : site.path("ties")) {
            double mw = t.path("scheduledFlowMw").asDouble(0);
            siteScheduledNiMw.merge(t.path("fromArea").asText(), mw, Double::sum);
            siteScheduledNiMw.merge(t.path("toArea").asText(), -mw, Double::sum);
        }
        for (JsonNode u : site.path("units")) {
            unitArea.put(u.path("id").asText(), u.path("area").asText());
        }
    }

    public static void main(String[] args) throws Exception {
        String broker = env("LOOPSTAND_BROKER_URL");
        JsonNode site = new ObjectMapper(new YAMLFactory()).readTree(new File(env("LOOPSTAND_SITE_FILE")));
        MinimalController c = new MinimalController(env("LOOPSTAND_TOPIC_ROOT"), env("LOOPSTAND_CONTROLLER_ID"), site);
        c.connect(broker);
        c.run();
    }

    private static String env(String name) {
        String v = System.getenv(name);
        if (v == null || v.isBlank()) {
            System.err.println("minimal-controller: environment variable " + name + " is not set");
            System.exit(2);
        }
        return v;
    }

    void connect(String broker) throws MqttException {
        client = new MqttClient(broker, id, new MemoryPersistence());
        client.setCallback(this);
        MqttConnectionOptions o = new MqttConnectionOptions();
        o.setCleanStart(true);
        o.setAutomaticReconnect(true);
        MqttMessage will = new MqttMessage(status("offline", List.of("connectionLost"), System.currentTimeMillis(), null));
        will.setQos(1);
        will.setRetained(true);
        o.setWill(root + "/controller/" + id + "/status", will);
        client.connect(o);
        for (String filter : List.of("/clock", "/run", "/area/+/meter/+", "/area/+/schedule", "/unit/+/telemetry", "/unit/+/ack")) {
            client.subscribe(root + filter, 1);
        }
        publish("/controller/" + id + "/status", status("suspended", List.of("starting"), System.currentTimeMillis(), null), true, 0);
        System.out.println("minimal-controller: " + id + " connected to " + broker + " under " + root);
    }

    void run() throws Exception {
        long nextCycleMs = -1;
        while (!ended) {
            Thread.sleep(50);
            long now = scenarioNowMs();
            if (now < 0 || !running) {
                continue;
            }
            if (nextCycleMs < 0) {
                nextCycleMs = now;
            }
            if (now >= nextCycleMs) {
                cycle(now);
                nextCycleMs += CYCLE_MS * ((now - nextCycleMs) / CYCLE_MS + 1);
            }
        }
        publish("/controller/" + id + "/status", status("off", List.of("runEnded"), Math.max(1, scenarioNowMs()), null), true, 0);
        client.disconnect();
        client.close();
        System.out.println("minimal-controller: the plant announced the end of the run; stopped");
    }

    /** Scenario epoch ms now: the last clock tick's time, advanced by wall time since at the tick's rate. */
    long scenarioNowMs() {
        if (tickScenarioEpochMs < 0) {
            return -1;
        }
        long wallMs = (System.nanoTime() - tickWallNanos) / 1_000_000L;
        return tickScenarioEpochMs + (running ? Math.round(wallMs * rate) : 0);
    }

    private void cycle(long now) throws MqttException {
        cycle++;
        ObjectNode aces = json.createObjectNode();
        List<String> reasons = new ArrayList<>();
        for (String area : betaMwPerHz.keySet()) {
            JsonNode m = meters.get(area);
            if (m == null || now - m.path("sourceTime").asLong() > STALE_MS) {
                reasons.add("staleMeter:" + area);
                continue;
            }
            JsonNode s = schedules.get(area);
            double niS = s != null ? s.path("scheduledNetInterchangeMw").asDouble() : siteScheduledNiMw.get(area);
            double fS = s != null ? s.path("scheduledFrequencyHz").asDouble() : nominalHz.get(area);
            // + = over-generation: too much export, or frequency above schedule
            double ace = (m.path("netInterchangeMw").asDouble() - niS) + betaMwPerHz.get(area) * (m.path("frequencyHz").asDouble() - fS);
            aces.put(area, ace);
            if (Math.abs(ace) > DEAD_BAND_MW) {
                pulses(area, -ace * GAIN_PER_CYCLE, now);
            }
        }
        publish("/controller/" + id + "/status", status(reasons.isEmpty() ? "regulating" : "suspended", reasons, now, aces), true, 0);
    }

    private void pulses(String area, double moveMw, long now) throws MqttException {
        List<JsonNode> units = new ArrayList<>();
        for (JsonNode t : telemetry.values()) {
            if (area.equals(unitArea.get(t.path("unit").asText())) && "online".equals(t.path("status").asText())
                    && "remote".equals(t.path("controlMode").asText()) && t.path("pulseRateMwPerMin").asDouble() > 0) {
                units.add(t);
            }
        }
        for (JsonNode t : units) {
            double share = moveMw / units.size();
            double room = share > 0 ? t.path("regulatingMaxMw").asDouble() - t.path("setpointMw").asDouble()
                    : t.path("setpointMw").asDouble() - t.path("regulatingMinMw").asDouble();
            double mw = Math.min(Math.abs(share), Math.max(0, room));
            long ms = Math.min(MAX_PULSE_MS, Math.round(mw / t.path("pulseRateMwPerMin").asDouble() * 60_000));
            if (ms < 100) {
                continue;
            }
            long validUntil = now + 2 * CYCLE_MS;
            ObjectNode c = json.createObjectNode();
            c.put("seq", seq++);
            c.put("sourceTime", now);
            c.put("unit", t.path("unit").asText());
            c.put("controllerId", id);
            c.put("epoch", epoch);
            c.put("issuedAt", now);
            c.put("validUntil", validUntil);
            c.put("kind", "pulse");
            c.put("direction", share > 0 ? "raise" : "lower");
            c.put("durationMs", ms);
            // MQTT expiry is wall seconds: the scenario-time lifetime divided by the rate, at least 1 s
            long expiryS = Math.max(1, (long) Math.ceil((validUntil - now) / rate / 1000.0));
            publish("/unit/" + t.path("unit").asText() + "/command", bytes(c), false, expiryS);
        }
    }

    private byte[] status(String state, List<String> reasons, long sourceTime, ObjectNode aces) {
        ObjectNode s = json.createObjectNode();
        s.put("seq", seq++);
        s.put("sourceTime", sourceTime);
        s.put("controllerId", id);
        s.put("epoch", epoch);
        s.put("state", state);
        ArrayNode r = s.putArray("reasons");
        reasons.forEach(r::add);
        s.put("cycle", cycle);
        ArrayNode areas = s.putArray("areas");
        if (aces != null) {
            aces.fields().forEachRemaining(e -> areas.addObject().put("area", e.getKey()).put("aceMw", e.getValue().asDouble())
                    .put("filteredAceMw", e.getValue().asDouble()).put("band", "regulating"));
        }
        return bytes(s);
    }

    private byte[] bytes(JsonNode n) {
        try {
            return json.writeValueAsBytes(n);
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
    }

    private void publish(String topic, byte[] payload, boolean retained, long expiryS) throws MqttException {
        MqttMessage m = new MqttMessage(payload);
        m.setQos(1);
        m.setRetained(retained);
        if (expiryS > 0) {
            MqttProperties p = new MqttProperties();
            p.setMessageExpiryInterval(expiryS);
            m.setProperties(p);
        }
        client.publish(root + topic, m);
    }

    /** Paho's thread: only store what arrived; all publishing happens on the main loop. */
    @Override
    public void messageArrived(String topic, MqttMessage message) {
        JsonNode n;
        try {
            n = json.readTree(new String(message.getPayload(), StandardCharsets.UTF_8));
        } catch (Exception e) {
            return;
        }
        String rest = topic.substring(root.length());
        if (rest.equals("/clock")) {
            tickWallNanos = System.nanoTime();
            tickScenarioEpochMs = n.path("sourceTime").asLong();
            rate = n.path("rate").asDouble(1);
            running = n.path("running").asBoolean();
        } else if (rest.equals("/run")) {
            ended = "ended".equals(n.path("phase").asText());
        } else if (rest.endsWith("/schedule")) {
            schedules.put(n.path("area").asText(), n);
        } else if (rest.contains("/meter/")) {
            meters.put(n.path("area").asText(), n);
        } else if (rest.endsWith("/telemetry")) {
            telemetry.put(n.path("unit").asText(), n);
        } else if (rest.endsWith("/ack") && "rejected".equals(n.path("outcome").asText())) {
            System.out.println(String.format(Locale.ROOT, "minimal-controller: command %d refused by %s: %s %s",
                    n.path("commandSeq").asLong(), n.path("unit").asText(), n.path("reason").asText(), n.path("detail").asText("")));
        }
    }

    @Override
    public void disconnected(MqttDisconnectResponse r) {
        System.out.println("minimal-controller: disconnected: " + r.getReasonString());
    }

    @Override
    public void mqttErrorOccurred(MqttException e) {
        System.out.println("minimal-controller: MQTT error: " + e.getMessage());
    }

    @Override
    public void deliveryComplete(IMqttToken token) {
    }

    @Override
    public void connectComplete(boolean reconnect, String serverUri) {
    }

    @Override
    public void authPacketArrived(int reasonCode, MqttProperties properties) {
    }
}
