package org.loopstand.bench.run;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.locks.LockSupport;
import java.util.function.Consumer;
import org.HdrHistogram.Histogram;
import org.loopstand.bench.broker.BenchBroker;
import org.loopstand.bench.probe.PublishStamps;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.bench.raw.RawPahoLoop;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.controller.config.ControllerSiteConfig;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.controller.runtime.ControllerAgent;
import org.loopstand.plant.grid.Grid;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.bus.BusCounters;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * One bench run, layout one-jvm: generates the site, starts the broker, the plant ({@link PlantSide})
 * and the controller ({@link ControllerSide}) in this JVM on the same clock, the raw Paho loop beside
 * them, measures for the duration and returns the figures. The layout processes is {@link ProcessesBench}.
 */
public final class BusBench {
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
        try (BenchBroker broker = BenchBroker.start(s.broker(), s.brokerConfig(), s.outDir())) {
            say.accept("bench: broker " + broker.kind() + " at " + broker.serverUri());
            PlantSide plant = new PlantSide(s, grid, broker.serverUri(), stamps, tally, clock, say);
            int telemetryBytes = plant.telemetryBytes();
            ControllerSide ctl = new ControllerSide(s, ctlSite, siteId, broker.serverUri(), stamps, tally, clock,
                    s.outDir().resolve("controller.hlog"));
            ControllerAgent agent = ctl.agent();
            ProbedController probed = ctl.probed();
            ctl.start();
            plant.awaitConnected();
            say.accept("bench: layout one-jvm, " + s.units() + " units, " + s.areas() + " areas, grouping " + s.grouping().cliName()
                    + (s.grouping() == org.loopstand.plant.runtime.ConnectionGrouping.POOLED ? " " + s.poolSize() : "")
                    + " (" + plant.connections() + " plant connections), " + s.intakeConnections()
                    + " controller intake connection(s), telemetry " + telemetryBytes + " B");
            plant.start();
            RawPahoLoop raw = s.raw() ? rawLoop(s, broker.serverUri(), telemetryBytes, plant.stepS(), clock) : null;
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
            Counts before = counts(agent, stamps, raw);
            Histogram latenessAtWarmup = plant.latenessUs();
            sampler.reset();
            long markEpochMs = clock.epochMillis();
            long t0 = clock.monotonicNanos();
            long end = t0 + Math.round(s.durationS() * 1e9);
            long nextSample = t0 + Math.round(s.sampleS() * 1e9);
            while (clock.monotonicNanos() < end && ctl.isRunning() && plant.failure() == null) {
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
            Counts after = counts(agent, stamps, raw);
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
            ctl.stopCycles();
            LockSupport.parkNanos(3_000_000_000L);
            stamps.settle(ctlStopNanos - 1_000_000_000L);
            Histogram lateness = plant.latenessUs();
            lateness.subtract(latenessAtWarmup);
            Map<String, Long> failed = new TreeMap<>();
            tally.failedByReason.forEach((k, v) -> failed.put(k, v.sum()));
            BusCounters ctlCounters = ctl.counters();
            BusCounters plantCounters = plant.counters();
            Throwable plantFailure = plant.failure();
            say.accept("bench: " + plant.spreadFigures());
            plant.close();
            ctl.closeBus();
            Histogram jitter = JitterLog.since(s.outDir().resolve("controller.hlog"), markEpochMs);
            return new BenchResult(s, broker.kind(), plant.connections(), telemetryBytes, measuredS, before, after,
                    rig, rigArrival, rawH, unitAge, meterAge, cycleWork, jitter,
                    tally.commandsPublished.sum(), tally.commandsPubacked.sum(), tally.commandsFailed.sum(), failed,
                    tally.commandsArrived.sum(), tally.acksPublished.sum(), tally.acksReceived.sum(),
                    stamps.expired(), ctlCounters.dropped(), plantCounters.dropped(), plantCounters.sendFailed(),
                    agent.intake().rejectedByReason(), Map.of("bench JVM (plant, controller, raw loop)", sampler.samples()), lateness,
                    plantFailure == null ? null : plantFailure.toString());
        }
    }

    /** Counters read at the start and end of the measured window. */
    public record Counts(long routed, long stamped, long matched, long rawSent, long rawReceived, long rawFailed, long cycles) {
    }

    private static Counts counts(ControllerAgent agent, PublishStamps st, RawPahoLoop raw) {
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

    /**
     * The bench's raw loop: the rig's telemetry rate and size, paced as {@code s.rawPacing()} says
     * (1 ms slots, or one burst per physics step of {@code stepS} s), started.
     */
    static RawPahoLoop rawLoop(BenchSettings s, String serverUri, int payloadBytes, double stepS, Clock clock)
            throws MqttException {
        long slot = s.rawPacing() == BenchSettings.RawPacing.BURST ? Math.round(stepS * 1e9) : 1_000_000L;
        return new RawPahoLoop(serverUri, "bench-raw", "bench/raw", s.units() * 1000.0 / s.telemetryScanMs(),
                payloadBytes, 0, slot, clock).start();
    }
}
