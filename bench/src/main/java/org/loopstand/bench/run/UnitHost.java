package org.loopstand.bench.run;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.atomic.LongAdder;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.Recorder;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.plant.grid.GeneratingUnit;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.runtime.UnitProcess;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.ForwardingBus;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.MessageListener;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AckOutcome;
import org.loopstand.protocol.message.CommandAck;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.topic.TopicKind;
import org.loopstand.protocol.topic.UnitTopicRouter;

/**
 * A unit host of the hosts bench: the real plant interfaces ({@link UnitProcess}) of a share of the site's units,
 * in one process, as `loopstand unit` runs one. To host thousands in one JVM they share a pool of connections
 * (no per-unit client id or last will) and one thread that scans them all every unit scan period, as the
 * plant does with its own units. The pool subscribes one wildcard filter per unit topic kind (commands, field
 * readings) rather than two topics per unit, and a {@link UnitTopicRouter} hands each message to its unit: an
 * Artemis node makes a queue per subscription, and per-unit subscriptions kept 3,000 and 10,000 units from
 * starting (docs/performance.md). Probes count what goes out and in, and time each command from the
 * controller's {@code issuedAt} to its arrival here (both epoch ms of the machine's one clock).
 */
final class UnitHost implements AutoCloseable {
    private final List<MqttLink> links = new ArrayList<>();
    private final List<UnitProcess> units = new ArrayList<>();
    private final AgentRunner runner;
    private final MessageCodec codec = new MessageCodec();
    private final Clock clock;
    private final long connectWaitMs;
    final StampingBus.CommandTally tally = new StampingBus.CommandTally();
    /** command arrival minus its issuedAt, ms */
    final Recorder commandLatencyMs = new Recorder(3);
    final Set<String> unitsCommanded = ConcurrentHashMap.newKeySet();
    final LongAdder fieldReadingsReceived = new LongAdder();
    final Map<String, LongAdder> acksRejectedByReason = new ConcurrentHashMap<>();
    /** routes commands and field readings, which arrive over one wildcard subscription each, to their units */
    final UnitTopicRouter router;

    /**
     * @param share  this host serves the units whose index in the site modulo {@code shares} is {@code share}
     * @param shares unit hosts in the run, ≥ 1
     */
    UnitHost(BenchSettings s, Grid grid, String serverUri, int share, int shares, Clock clock) {
        this.connectWaitMs = BenchLinks.connectWaitMs(s, 60_000);
        this.clock = clock;
        List<GeneratingUnit> mine = share(grid, share, shares);
        if (mine.isEmpty()) {
            throw new IllegalArgumentException("unit share " + share + "/" + shares + " holds no unit");
        }
        for (int k = 0; k < Math.min(s.poolSize(), mine.size()); k++) {
            links.add(new MqttLink(BenchLinks.configure(MqttLinkConfig.builder().serverUri(serverUri)
                    .clientId(clientIdPrefix(grid.siteId(), share) + k).receiveQueueCapacity(100_000), s).build(), clock));
        }
        // one wildcard per kind for the whole site, on different connections of the pool so that their
        // delivery threads share the work; the other host's units' messages are counted and dropped
        router = new UnitTopicRouter(grid.siteId())
                .route(TopicKind.UNIT_COMMAND, links.get(0), Qos.AT_LEAST_ONCE)
                .route(TopicKind.FIELD_READING, links.get(1 % links.size()), Qos.AT_MOST_ONCE);
        List<MessageBus> pool = new ArrayList<>();
        for (MqttLink l : links) {
            pool.add(new Probe(new StampingBus(router.view(l), null, clock, tally)));
        }
        int[] next = {0};
        LinkFactory shared = (clientId, will) -> pool.get(next[0]++ % pool.size());
        InterfaceOptions iface = InterfaceOptions.defaults().withTelemetryScanMs(s.telemetryScanMs(), Map.of());
        long periodNanos = s.telemetryScanMs() * 1_000_000L;
        // a controller status reaches every unit of a connection as one payload: decode it once, not once per
        // unit (5,000 units per host each decoding every 4 s status of 50 areas took the scan thread's time)
        UnitDutyCycle.StatusDecoding statusDecoding = new UnitDutyCycle.StatusDecoding(codec);
        for (int i = 0; i < mine.size(); i++) {
            UnitProcess u = new UnitProcess(grid.siteId(), mine.get(i), iface, Qos.AT_MOST_ONCE, shared, clock);
            u.agent().dutyCycle().shareStatusDecoding(statusDecoding);
            u.agent().dutyCycle().unit().staggerTelemetry(i * periodNanos / mine.size());
            units.add(u);
        }
        runner = new AgentRunner(new ScanAll(s.unitScanMs() * 1_000_000L), 1_000_000L);
    }

    /** @return the units a unit host of {@code shares} serves: those whose index in the site modulo shares is share */
    static List<GeneratingUnit> share(Grid grid, int share, int shares) {
        List<GeneratingUnit> mine = new ArrayList<>();
        for (int i = share; i < grid.units().size(); i += shares) {
            mine.add(grid.units().get(i));
        }
        return mine;
    }

    /** @return the client id prefix of a unit host's pooled connections */
    static String clientIdPrefix(String siteId, int share) {
        return siteId + "-unithost" + share + "-";
    }

    /** Starts the scan, then the links (the first connect subscribes all), and waits for them. */
    void start() throws InterruptedException {
        runner.start();
        BenchLinks.startAndAwait(links, connectWaitMs, "unit host");
    }

    int unitCount() {
        return units.size();
    }

    int connections() {
        return links.size();
    }

    Histogram latencyIntervalMs() {
        return commandLatencyMs.getIntervalHistogram();
    }

    boolean isRunning() {
        return runner.isRunning();
    }

    @Override
    public void close() {
        runner.close();
        links.forEach(MqttLink::close);
    }

    /** Every unit's duty cycle, once per scan period (0: every pass). */
    private final class ScanAll implements Agent {
        private final long scanNanos;
        private long nextNanos;

        ScanAll(long scanNanos) {
            this.scanNanos = scanNanos;
        }

        @Override
        public int doWork() {
            long now = clock.monotonicNanos();
            if (now < nextNanos) {
                return 0;
            }
            nextNanos = now + scanNanos;
            int work = 0;
            for (UnitProcess u : units) {
                work += u.agent().doWork();
            }
            return work;
        }

        @Override
        public String roleName() {
            return "unit-host";
        }
    }

    /** One pooled connection as each of its units sees it: closing a unit leaves the connection open; probes. */
    private final class Probe extends ForwardingBus {
        Probe(MessageBus inner) {
            super(inner);
        }

        @Override
        public CompletableFuture<Void> publish(OutboundMessage m) {
            if (m.topic().endsWith("/ack")) {
                codec.decode(m.payload(), CommandAck.class).message().filter(a -> a.outcome() == AckOutcome.REJECTED)
                        .ifPresent(a -> acksRejectedByReason.computeIfAbsent(String.valueOf(a.reason()),
                                k -> new LongAdder()).increment());
            }
            return inner.publish(m);
        }

        @Override
        public void subscribe(String topicFilter, Qos qos, MessageListener listener) {
            if (topicFilter.endsWith("/command")) {
                inner.subscribe(topicFilter, qos, msg -> {
                    long arrivedMs = clock.epochMillis();
                    codec.decode(msg.payload(), UnitCommand.class).message().ifPresent(c -> {
                        commandLatencyMs.recordValue(Math.max(0, arrivedMs - c.issuedAt()));
                        unitsCommanded.add(c.unit());
                    });
                    listener.onMessage(msg);
                });
            } else if (topicFilter.endsWith("/reading")) {
                inner.subscribe(topicFilter, qos, msg -> {
                    fieldReadingsReceived.increment();
                    listener.onMessage(msg);
                });
            } else {
                inner.subscribe(topicFilter, qos, listener);
            }
        }

        @Override
        public void close() {
            // the connection is shared: closed with the host
        }
    }
}
