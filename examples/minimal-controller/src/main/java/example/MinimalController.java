package example;

import java.io.File;
import java.time.Instant;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
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
 * to the area's units in remote, shared by pulse rate. It suspends an area whose meter is stale and stops
 * when the plant announces the end of the run. A demonstration of the contract, not a controller to
 * put in front of a real plant.
 */
public final class MinimalController implements MqttCallback {
    static final long CYCLE_MS = 4_000;
    static final long STALE_MS = 6_000;
    static final double DEAD_BAND_MW = 5;
    static final double GAIN_PER_CYCLE = 0.25;
    /** A pulse at most as long as a cycle, less a little, so pulses of one unit never overlap. */
    static final long MAX_PULSE_MS = 3_800;

    private final ObjectMapper json = new ObjectMapper();
    private final Layout layout;
    private final String root;
    private final String site;
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

    MinimalController(Layout layout, String root, String siteId, String id, JsonNode site) {
        this.layout = layout;
        this.root = root;
        this.site = siteId;
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
        // MINIMAL_LAYOUT=kilo-gateway: speak the invented gateway layout of config/profiles/kilo-gateway.yaml
        Layout layout = Layout.named(System.getenv().getOrDefault("MINIMAL_LAYOUT", "contract"));
        MinimalController c = new MinimalController(layout, env("LOOPSTAND_TOPIC_ROOT"), env("LOOPSTAND_SITE_ID"),
                env("LOOPSTAND_CONTROLLER_ID"), site);
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
        o.setWill(topic("status", null), will);
        client.connect(o);
        for (String which : List.of("clock", "run", "meter", "schedule", "telemetry", "ack")) {
            client.subscribe(topic(which, null), 1);
        }
        publish(topic("status", null), status("suspended", List.of("starting"), System.currentTimeMillis(), null), true, 0);
        System.out.println("minimal-controller: " + id + " connected to " + broker + ", layout " + layout.name());
    }

    private String topic(String which, String unit) {
        return layout.topic(which, root, site, id, unit);
    }

    void run() throws Exception {
        long nextCycleMs = -1;
        long lastWaitingStatusNanos = System.nanoTime();
        while (!ended) {
            Thread.sleep(50);
            long now = scenarioNowMs();
            if (now < 0 || !running) {
                // a heartbeat while scenario time stands still: the units' watchdog counts from the go
                if (System.nanoTime() - lastWaitingStatusNanos > 1_000_000_000L) {
                    lastWaitingStatusNanos = System.nanoTime();
                    publish(topic("status", null), status("suspended", List.of("waitingForScenario"),
                            now < 0 ? System.currentTimeMillis() : now, null), true, 0);
                }
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
        publish(topic("status", null), status("off", List.of("runEnded"), Math.max(1, scenarioNowMs()), null), true, 0);
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
            if (m == null || now - layout.time(m, "AreaMeter", "sourceTime") > STALE_MS) {
                reasons.add("staleMeter:" + area);
                continue;
            }
            JsonNode s = schedules.get(area);
            double niS = s != null ? layout.num(s, "Schedule", "scheduledNetInterchangeMw") : siteScheduledNiMw.get(area);
            double fS = s != null ? layout.num(s, "Schedule", "scheduledFrequencyHz") : nominalHz.get(area);
            // + = over-generation: too much export, or frequency above schedule
            double ace = (layout.num(m, "AreaMeter", "netInterchangeMw") - niS)
                    + betaMwPerHz.get(area) * (layout.num(m, "AreaMeter", "frequencyHz") - fS);
            aces.put(area, ace);
            if (Math.abs(ace) > DEAD_BAND_MW) {
                pulses(area, -ace * GAIN_PER_CYCLE, now);
            }
        }
        publish(topic("status", null), status(reasons.isEmpty() ? "regulating" : "suspended", reasons, now, aces), true, 0);
    }

    private void pulses(String area, double moveMw, long now) throws MqttException {
        // the area's units in remote with room in the asked direction, each given a share in proportion
        // to its pulse rate, so a fast unit takes more and a unit at its limit takes none
        List<JsonNode> units = new ArrayList<>();
        double totalRate = 0;
        for (JsonNode t : telemetry.values()) {
            String u = "UnitTelemetry";
            double setpoint = layout.num(t, u, "setpointMw");
            double room = moveMw > 0 ? layout.num(t, u, "regulatingMaxMw") - setpoint : setpoint - layout.num(t, u, "regulatingMinMw");
            if (area.equals(unitArea.get(layout.text(t, u, "unit"))) && "online".equals(layout.text(t, u, "status"))
                    && "remote".equals(layout.text(t, u, "controlMode")) && layout.num(t, u, "pulseRateMwPerMin") > 0 && room > 0.1) {
                units.add(t);
                totalRate += layout.num(t, u, "pulseRateMwPerMin");
            }
        }
        for (JsonNode t : units) {
            double rateMwPerMin = layout.num(t, "UnitTelemetry", "pulseRateMwPerMin");
            double share = moveMw * rateMwPerMin / totalRate;
            long ms = Math.min(MAX_PULSE_MS, Math.round(Math.abs(share) / rateMwPerMin * 60_000));
            if (ms < 100) {
                continue;
            }
            long validUntil = now + 2 * CYCLE_MS;
            String unit = layout.text(t, "UnitTelemetry", "unit");
            String k = "UnitCommand";
            ObjectNode c = json.createObjectNode();
            layout.putNum(c, k, "seq", seq++);
            layout.putTime(c, k, "sourceTime", now);
            layout.putText(c, k, "unit", unit);
            layout.putText(c, k, "controllerId", id);
            layout.putNum(c, k, "epoch", epoch);
            layout.putTime(c, k, "issuedAt", now);
            layout.putTime(c, k, "validUntil", validUntil);
            layout.putText(c, k, "kind", "pulse");
            layout.putText(c, k, "direction", share > 0 ? "raise" : "lower");
            layout.putNum(c, k, "durationMs", ms);
            // MQTT expiry is wall seconds: the scenario-time lifetime divided by the rate, at least 1 s
            long expiryS = Math.max(1, (long) Math.ceil((validUntil - now) / rate / 1000.0));
            publish(topic("command", unit), bytes(c), false, expiryS);
        }
    }

    private byte[] status(String state, List<String> reasons, long sourceTime, ObjectNode aces) {
        String k = "ControllerStatus";
        ObjectNode s = json.createObjectNode();
        layout.putNum(s, k, "seq", seq++);
        layout.putTime(s, k, "sourceTime", sourceTime);
        layout.putText(s, k, "controllerId", id);
        layout.putNum(s, k, "epoch", epoch);
        layout.putText(s, k, "state", state);
        ArrayNode r = s.putArray(layout.fieldName(k, "reasons"));
        reasons.forEach(r::add);
        layout.putNum(s, k, "cycle", cycle);
        ArrayNode areas = s.putArray(layout.fieldName(k, "areas"));
        if (aces != null) {
            aces.fields().forEachRemaining(e -> {
                ObjectNode a = areas.addObject();
                layout.putText(a, "AreaAce", "area", e.getKey());
                layout.putNum(a, "AreaAce", "aceMw", e.getValue().asDouble());
                layout.putNum(a, "AreaAce", "filteredAceMw", e.getValue().asDouble());
                layout.putText(a, "AreaAce", "band", "regulating");
            });
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
        client.publish(topic, m);
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
        if (layout.is("clock", topic, root, site)) {
            tickWallNanos = System.nanoTime();
            tickScenarioEpochMs = layout.time(n, "ClockTick", "sourceTime");
            rate = layout.num(n, "ClockTick", "rate");
            running = layout.node(n, "ClockTick", "running").asBoolean();
        } else if (layout.is("run", topic, root, site)) {
            ended = "ended".equals(layout.text(n, "RunState", "phase"));
        } else if (layout.is("schedule", topic, root, site)) {
            schedules.put(layout.text(n, "Schedule", "area"), n);
        } else if (layout.is("meter", topic, root, site)) {
            meters.put(layout.text(n, "AreaMeter", "area"), n);
        } else if (layout.is("telemetry", topic, root, site)) {
            telemetry.put(layout.text(n, "UnitTelemetry", "unit"), n);
        } else if (layout.is("ack", topic, root, site) && "rejected".equals(layout.text(n, "CommandAck", "outcome"))) {
            System.out.println(String.format(Locale.ROOT, "minimal-controller: command %d refused by %s: %s %s",
                    (long) layout.num(n, "CommandAck", "commandSeq"), layout.text(n, "CommandAck", "unit"),
                    n.path("reason").asText(), n.path("detail").asText("")));
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

    /**
     * The topic and payload layout the controller speaks: Loopstand's own contract, or the invented
     * "kilo gateway" layout of config/profiles/kilo-gateway.yaml (kW, mHz, import sign, ISO-8601 times,
     * other names), as a controller that cannot change its payloads would. Values are handed to the
     * controller in the contract's units and signs whatever the layout.
     */
    static final class Layout {
        private final String name;
        /** message → topic template below nothing ({root} = the contract's topic root, {site} = the site id) */
        private final Map<String, String> topics;
        /** "Message.field" → name on the wire; absent = the contract's name */
        private final Map<String, String> names;
        /** "Message.field" → wire value per contract value (negative = the sign is flipped); absent = 1 */
        private final Map<String, Double> scales;
        /** "Message.field" written as ISO-8601 text */
        private final Set<String> isoTimes;

        private Layout(String name, Map<String, String> topics, Map<String, String> names, Map<String, Double> scales,
                       Set<String> isoTimes) {
            this.name = name;
            this.topics = topics;
            this.names = names;
            this.scales = scales;
            this.isoTimes = isoTimes;
        }

        static Layout named(String layout) {
            return switch (layout) {
                case "contract" -> new Layout(layout, Map.of("clock", "{root}/clock", "run", "{root}/run",
                        "meter", "{root}/area/+/meter/+", "schedule", "{root}/area/+/schedule", "telemetry", "{root}/unit/+/telemetry",
                        "ack", "{root}/unit/+/ack", "status", "{root}/controller/{id}/status", "command", "{root}/unit/{unit}/command"),
                        Map.of(), Map.of(), Set.of());
                case "kilo-gateway" -> kiloGateway();
                default -> throw new IllegalArgumentException("unknown layout '" + layout + "' (contract or kilo-gateway)");
            };
        }

        private static Layout kiloGateway() {
            Map<String, String> topics = Map.of("clock", "gw/{site}/time", "run", "gw/{site}/session",
                    "meter", "gw/{site}/zone/+/measurement/+", "schedule", "gw/{site}/zone/+/plan", "telemetry", "gw/{site}/gen/+/state",
                    "ack", "gw/{site}/gen/+/reply", "status", "gw/{site}/agc/{id}/health", "command", "gw/{site}/gen/{unit}/order");
            Map<String, String> names = Map.ofEntries(Map.entry("AreaMeter.sourceTime", "stamp"), Map.entry("AreaMeter.area", "zone"),
                    Map.entry("AreaMeter.frequencyHz", "freq_mHz"), Map.entry("AreaMeter.netInterchangeMw", "import_kW"),
                    Map.entry("Schedule.area", "zone"), Map.entry("Schedule.scheduledNetInterchangeMw", "plannedImport_kW"),
                    Map.entry("Schedule.scheduledFrequencyHz", "plannedFreq_mHz"),
                    Map.entry("UnitTelemetry.unit", "gen"), Map.entry("UnitTelemetry.status", "condition"),
                    Map.entry("UnitTelemetry.controlMode", "mode"), Map.entry("UnitTelemetry.setpointMw", "ref_kW"),
                    Map.entry("UnitTelemetry.regulatingMinMw", "min_kW"), Map.entry("UnitTelemetry.regulatingMaxMw", "max_kW"),
                    Map.entry("UnitTelemetry.pulseRateMwPerMin", "pulseRate_kWpm"),
                    Map.entry("UnitCommand.seq", "n"), Map.entry("UnitCommand.sourceTime", "stamp"), Map.entry("UnitCommand.unit", "gen"),
                    Map.entry("UnitCommand.controllerId", "agc"), Map.entry("UnitCommand.issuedAt", "issued"),
                    Map.entry("UnitCommand.validUntil", "expires"), Map.entry("UnitCommand.kind", "type"),
                    Map.entry("UnitCommand.direction", "dir"), Map.entry("UnitCommand.durationMs", "duration_s"),
                    Map.entry("CommandAck.unit", "gen"), Map.entry("CommandAck.commandSeq", "order_n"), Map.entry("CommandAck.outcome", "result"),
                    Map.entry("ControllerStatus.seq", "n"), Map.entry("ControllerStatus.sourceTime", "stamp"),
                    Map.entry("ControllerStatus.controllerId", "agc"), Map.entry("ControllerStatus.areas", "zones"),
                    Map.entry("AreaAce.area", "zone"), Map.entry("AreaAce.aceMw", "ace_kW"), Map.entry("AreaAce.filteredAceMw", "aceFiltered_kW"),
                    Map.entry("ClockTick.sourceTime", "stamp"), Map.entry("RunState.phase", "stage"));
            Map<String, Double> scales = Map.ofEntries(Map.entry("AreaMeter.frequencyHz", 1000.0),
                    Map.entry("AreaMeter.netInterchangeMw", -1000.0), Map.entry("Schedule.scheduledNetInterchangeMw", -1000.0),
                    Map.entry("Schedule.scheduledFrequencyHz", 1000.0), Map.entry("UnitTelemetry.setpointMw", 1000.0),
                    Map.entry("UnitTelemetry.regulatingMinMw", 1000.0), Map.entry("UnitTelemetry.regulatingMaxMw", 1000.0),
                    Map.entry("UnitTelemetry.pulseRateMwPerMin", 1000.0), Map.entry("UnitCommand.durationMs", 0.001),
                    Map.entry("AreaAce.aceMw", 1000.0), Map.entry("AreaAce.filteredAceMw", 1000.0));
            Set<String> iso = Set.of("AreaMeter.sourceTime", "UnitCommand.sourceTime", "UnitCommand.issuedAt", "UnitCommand.validUntil",
                    "ControllerStatus.sourceTime", "ClockTick.sourceTime");
            return new Layout("kilo-gateway", topics, names, scales, iso);
        }

        String name() {
            return name;
        }

        /** @return the topic (or filter) of a message, with the root, site, controller id and unit filled in */
        String topic(String which, String root, String site, String id, String unit) {
            return topics.get(which).replace("{root}", root).replace("{site}", site).replace("{id}", id)
                    .replace("{unit}", unit == null ? "+" : unit);
        }

        /** @return true when {@code topic} is of the kind {@code which} (a filter with + levels) */
        boolean is(String which, String topic, String root, String site) {
            String[] filter = topic(which, root, site, "+", null).split("/", -1);
            String[] levels = topic.split("/", -1);
            if (filter.length != levels.length) {
                return false;
            }
            for (int i = 0; i < levels.length; i++) {
                if (!filter[i].equals("+") && !filter[i].equals(levels[i])) {
                    return false;
                }
            }
            return true;
        }

        private String wire(String msg, String field) {
            return names.getOrDefault(msg + "." + field, field);
        }

        /** @return a number in the contract's unit and sign */
        double num(JsonNode n, String msg, String field) {
            return n.path(wire(msg, field)).asDouble(Double.NaN) / scales.getOrDefault(msg + "." + field, 1.0);
        }

        /** @return a timestamp as epoch ms */
        long time(JsonNode n, String msg, String field) {
            JsonNode v = n.path(wire(msg, field));
            return isoTimes.contains(msg + "." + field) ? Instant.parse(v.asText()).toEpochMilli() : v.asLong();
        }

        String text(JsonNode n, String msg, String field) {
            return n.path(wire(msg, field)).asText();
        }

        JsonNode node(JsonNode n, String msg, String field) {
            return n.path(wire(msg, field));
        }

        void putNum(ObjectNode n, String msg, String field, double value) {
            double v = value * scales.getOrDefault(msg + "." + field, 1.0);
            if (v == Math.rint(v) && Math.abs(v) < 9e15) {
                n.put(wire(msg, field), (long) v);
            } else {
                n.put(wire(msg, field), v);
            }
        }

        void putTime(ObjectNode n, String msg, String field, long epochMs) {
            if (isoTimes.contains(msg + "." + field)) {
                n.put(wire(msg, field), Instant.ofEpochMilli(epochMs).toString());
            } else {
                n.put(wire(msg, field), epochMs);
            }
        }

        void putText(ObjectNode n, String msg, String field, String value) {
            n.put(wire(msg, field), value);
        }

        String fieldName(String msg, String field) {
            return wire(msg, field);
        }
    }
}
