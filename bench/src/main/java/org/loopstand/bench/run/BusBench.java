package org.loopstand.bench.run;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.locks.LockSupport;
import java.util.function.Consumer;
import org.HdrHistogram.Histogram;
import org.loopstand.bench.broker.BenchBroker;
import org.loopstand.bench.probe.CommandCountingBus;
import org.loopstand.bench.probe.PublishStamps;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.bench.raw.RawPahoLoop;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.plant.grid.Area;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.meter.MeterSettings;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.PlantOptions;
import org.loopstand.plant.runtime.PlantRunner;
import org.loopstand.plant.runtime.UnitDutyCycle;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.plant.unit.InterfaceOptions;
import org.loopstand.protocol.agent.AgentRunner;
import org.loopstand.protocol.bus.BusCounters;
import org.loopstand.protocol.bus.MessageBus;
import org.loopstand.protocol.bus.OutboundMessage;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.bus.mqtt.MqttLink;
import org.loopstand.protocol.bus.mqtt.MqttLinkConfig;
import org.loopstand.protocol.bus.mqtt.SharedSubscriptionBus;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * One bench run: generates the site, starts the broker, the plant (real {@link PlantRunner}) and the
 * controller (real {@link ControllerAgent} over a {@link SharedSubscriptionBus}) in this JVM on the
 * same clock, the raw Paho loop beside them, measures for the duration and returns the figures.
 */
public final class BusBench {
    private static final String CONTROLLER_ID = "controller-1";

    private final BenchSettings s;
    private final Consumer<String> say;
    private final Clock clock = WallClock.INSTANCE;

    public BusBench(BenchSettings settings, Consumer<String> say) {
        this.s = settings;
        this.say = say;
    }

    public BenchResult run() throws Exception {
        Files.createDirectories(s.outDir());
        String siteId = "bench-" + s.units();
        Path siteFile = SiteGenerator.write(s.outDir().resolve("site.yaml"), siteId, s.units(), s.areas(), s.cycleS());
        Grid grid = SiteLoader.load(siteFile);
        ControllerSiteConfig ctlSite = ControllerSiteReader.read(siteFile);
        PublishStamps stamps = new PublishStamps();
        StampingBus.CommandTally tally = new StampingBus.CommandTally();
        List<MqttLink> plantLinks = new ArrayList<>();
        try (BenchBroker broker = BenchBroker.start(s.broker(), s.brokerConfig(), s.outDir())) {
            say.accept("bench: broker " + broker.kind() + " at " + broker.serverUri());
            LinkFactory links = (clientId, will) -> {
                MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(broker.serverUri()).clientId(clientId);
                if (will != null) {
                    b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
                }
                MqttLink l = new MqttLink(b.build(), clock);
                plantLinks.add(l);
                return new StampingBus(l.start(), stamps, clock, tally);
            };
            List<MeterSettings> meters = new ArrayList<>();
            for (Area a : grid.areas()) {
                meters.add(MeterSettings.defaults(a.id()).withScanPeriodMs(s.meterScanMs()));
            }
            InterfaceOptions iface = InterfaceOptions.defaults().withTelemetryScanMs(s.telemetryScanMs(), Map.of());
            PlantOptions po = new PlantOptions(1.0, java.util.Set.of(), s.grouping(), s.poolSize(), meters, iface,
                    Qos.AT_MOST_ONCE, 256, 1, 1.0);
            GridSimulator sim = new GridSimulator(grid);
            PlantRunner plant = new PlantRunner(sim, loadSteps(grid, s), po, links, clock, say::accept)
                    .unitScanMs(s.unitScanMs());
            List<UnitDutyCycle> hosts = plant.unitCycles();
            long periodNanos = s.telemetryScanMs() * 1_000_000L;
            for (int i = 0; i < hosts.size(); i++) {
                hosts.get(i).unit().staggerTelemetry(i * periodNanos / hosts.size());
            }
            int telemetryBytes = new MessageCodec().encode(hosts.get(0).unit().telemetry()).length;

            long epoch = clock.epochMillis();
            OutboundMessage will = ControllerAgent.offlineStatus(siteId, CONTROLLER_ID, epoch, epoch);
            List<MqttLink> ctlLinks = new ArrayList<>();
            for (int k = 0; k < s.intakeConnections(); k++) {
                MqttLinkConfig.Builder b = MqttLinkConfig.builder().serverUri(broker.serverUri())
                        .clientId(CONTROLLER_ID + "-in" + k).receiveQueueCapacity(100_000);
                if (k == 0) {
                    b.lastWill(will.topic(), will.payload(), will.qos(), will.retained());
                }
                ctlLinks.add(new MqttLink(b.build(), clock));
            }
            SharedSubscriptionBus shared = new SharedSubscriptionBus(ctlLinks, "ctl",
                    f -> f.endsWith("/telemetry") || f.endsWith("/ack") || f.contains("/meter/"));
            MessageBus ctlBus = new CommandCountingBus(shared, tally);
            HistogramLogs hlog = HistogramLogs.create(s.outDir().resolve("controller.hlog"), clock, 60_000_000L, 3, 10_000);
            ControllerAgent agent = new ControllerAgent(ctlSite, ctlBus, clock, null, CONTROLLER_ID, epoch, null, hlog);
            agent.intake().setRouteProbe(stamps::routed);
            ProbedController probed = new ProbedController(agent, ctlSite.areas(), clock);
            AgentRunner ctlRunner = new AgentRunner(probed, 1_000_000L);
            if (s.wakeOnInput()) {
                agent.wakeOnInput(ctlRunner::wake);
            }
            ctlRunner.start(); // subscribes before the links connect: the first connect subscribes all
            for (MqttLink l : ctlLinks) {
                l.start();
            }
            for (MqttLink l : ctlLinks) {
                if (!l.awaitConnected(20_000)) {
                    throw new IllegalStateException("controller link " + l.clientId() + " did not connect");
                }
            }
            for (MqttLink l : plantLinks) {
                if (!l.awaitConnected(60_000)) {
                    throw new IllegalStateException("plant link " + l.clientId() + " did not connect");
                }
            }
            say.accept("bench: " + s.units() + " units, " + s.areas() + " areas, grouping " + s.grouping().cliName()
                    + (s.grouping() == org.loopstand.plant.runtime.ConnectionGrouping.POOLED ? " " + s.poolSize() : "")
                    + " (" + plantLinks.size() + " plant connections), " + s.intakeConnections()
                    + " controller intake connection(s), telemetry " + telemetryBytes + " B");
            plant.start();
            RawPahoLoop raw = s.raw() ? new RawPahoLoop(broker.serverUri(), "bench-raw", "bench/raw",
                    s.units() * 1000.0 / s.telemetryScanMs(), telemetryBytes, 0, clock).start() : null;
            ResourceSampler sampler = new ResourceSampler(clock, broker.pid());

            sleepS(s.warmupS(), stamps);
            // discard the warm-up
            stamps.publishToValidatedUs().getIntervalHistogram();
            stamps.publishToArrivalUs().getIntervalHistogram();
            probed.unitAgeMs.getIntervalHistogram();
            probed.meterAgeMs.getIntervalHistogram();
            probed.cycleWorkUs.getIntervalHistogram();
            if (raw != null) {
                raw.roundTripUs().getIntervalHistogram();
            }
            Counts before = counts(agent, stamps, raw, plant);
            Histogram latenessAtWarmup = plant.lateness().histogramUs();
            sampler.reset();
            long t0 = clock.monotonicNanos();
            long end = t0 + Math.round(s.durationS() * 1e9);
            long nextSample = t0 + Math.round(s.sampleS() * 1e9);
            while (clock.monotonicNanos() < end && ctlRunner.isRunning() && plant.failure() == null) {
                LockSupport.parkNanos(200_000_000L);
                stamps.expire(clock.monotonicNanos());
                if (clock.monotonicNanos() >= nextSample) {
                    var sm = sampler.sample();
                    say.accept(String.format(java.util.Locale.ROOT,
                            "bench: t=%.0f s heap after GC %.0f MB, used %.0f MB, JVM CPU %.0f %%, broker CPU %.0f %%, cycles %d",
                            sm.tS(), sm.heapAfterGcBytes() / 1e6, sm.heapUsedBytes() / 1e6, sm.jvmCpuPct(),
                            sm.brokerCpuPct(), agent.cyclesRun()));
                    say.accept("bench: " + probed.lastDecision);
                    nextSample += Math.round(s.sampleS() * 1e9);
                }
            }
            double measuredS = (clock.monotonicNanos() - t0) / 1e9;
            say.accept("bench: last decision " + probed.lastDecision);
            if (sampler.samples().isEmpty()) {
                sampler.sample();
            }
            Counts after = counts(agent, stamps, raw, plant);
            Histogram rig = stamps.publishToValidatedUs().getIntervalHistogram();
            Histogram rigArrival = stamps.publishToArrivalUs().getIntervalHistogram();
            Histogram rawH = raw == null ? null : raw.roundTripUs().getIntervalHistogram();
            Histogram unitAge = probed.unitAgeMs.getIntervalHistogram();
            Histogram meterAge = probed.meterAgeMs.getIntervalHistogram();
            Histogram cycleWork = probed.cycleWorkUs.getIntervalHistogram();
            if (raw != null) {
                raw.close();
            }
            // stop the cycles, then give the last commands' acks time to come back
            long ctlStopNanos = clock.monotonicNanos();
            ctlRunner.close();
            LockSupport.parkNanos(3_000_000_000L);
            stamps.settle(ctlStopNanos - 1_000_000_000L);
            Histogram lateness = plant.lateness().histogramUs();
            lateness.subtract(latenessAtWarmup);
            Map<String, Long> failed = new TreeMap<>();
            tally.failedByReason.forEach((k, v) -> failed.put(k, v.sum()));
            BusCounters ctlCounters = shared.counters();
            BusCounters plantCounters = new BusCounters();
            plantLinks.forEach(l -> plantCounters.addAll(l.counters()));
            Throwable plantFailure = plant.failure();
            plant.close();
            ctlBus.close();
            Histogram jitter = JitterLog.afterWarmup(s.outDir().resolve("controller.hlog"), s.warmupS());
            return new BenchResult(s, broker.kind(), plantLinks.size(), telemetryBytes, measuredS, before, after,
                    rig, rigArrival, rawH, unitAge, meterAge, cycleWork, jitter,
                    tally.commandsPublished.sum(), tally.commandsPubacked.sum(), tally.commandsFailed.sum(), failed,
                    tally.commandsArrived.sum(), tally.acksPublished.sum(), tally.acksReceived.sum(),
                    stamps.expired(), ctlCounters.dropped(), plantCounters.dropped(), plantCounters.sendFailed(),
                    agent.intake().rejectedByReason(), sampler.samples(), lateness,
                    plantFailure == null ? null : plantFailure.toString());
        }
    }

    /**
     * Load steps in the first area so that the controller has something to regulate (the generated
     * site starts balanced and would sit in the quiet band, sending nothing): ± the given MW at
     * 5 s of scenario time and then every 60 s with alternating sign, for the whole run.
     */
    private static List<org.loopstand.plant.scenario.ScenarioEvent> loadSteps(Grid grid, BenchSettings s) {
        List<org.loopstand.plant.scenario.ScenarioEvent> out = new ArrayList<>();
        if (s.loadStepMw() == 0) {
            return out;
        }
        String area = grid.areas().get(0).id();
        double sign = 1;
        for (double t = 5; t < s.warmupS() + s.durationS() + 60; t += 60, sign = -sign) {
            out.add(new org.loopstand.plant.scenario.PhysicsEvents.LoadStep(t, area, sign * s.loadStepMw()));
        }
        return out;
    }

    /** Counters read at the start and end of the measured window. */
    record Counts(long routed, long stamped, long matched, long rawSent, long rawReceived, long rawFailed, long cycles) {
    }

    private static Counts counts(ControllerAgent agent, PublishStamps st, RawPahoLoop raw, PlantRunner plant) {
        return new Counts(agent.intake().messagesRouted(), st.stamped(), st.matched(),
                raw == null ? 0 : raw.sent(), raw == null ? 0 : raw.received(), raw == null ? 0 : raw.failed(),
                agent.cyclesRun());
    }

    private void sleepS(double seconds, PublishStamps stamps) {
        long end = clock.monotonicNanos() + Math.round(seconds * 1e9);
        while (clock.monotonicNanos() < end) {
            LockSupport.parkNanos(200_000_000L);
            stamps.expire(clock.monotonicNanos());
        }
    }
}
