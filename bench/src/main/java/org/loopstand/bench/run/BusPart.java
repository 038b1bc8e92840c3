package org.loopstand.bench.run;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.OptionalLong;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.LockSupport;
import java.util.function.Consumer;
import org.HdrHistogram.Histogram;
import org.loopstand.bench.probe.StampingBus;
import org.loopstand.controller.config.ControllerSiteReader;
import org.loopstand.plant.site.SiteLoader;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * One part of a bench run in a process of its own (layouts processes and hosts): the plant, the controller
 * or a unit host ({@link UnitHost}), told by the bench on its standard input when the measured window starts
 * ({@code mark}) and ends ({@code stop}; or {@code end}, after which the plant and a unit host keep serving
 * until {@code stop}, so that the controller's last commands still find their units). It prints
 * {@code part: ready} once connected and running, {@code part: done} once its figures ({@link PartFigures})
 * are written.
 */
public final class BusPart {
    public static final String READY = "part: ready";
    public static final String DONE = "part: done";

    private final Clock clock = WallClock.INSTANCE;
    private final BenchSettings s;
    private final String siteId;
    private final String serverUri;
    private final Consumer<String> say;
    private final LinkedBlockingQueue<String> orders = new LinkedBlockingQueue<>();
    private String lastOrder = "";
    private int unitShare;
    private int unitShares = 1;

    public BusPart(Path settingsFile, String siteId, String serverUri, Consumer<String> say) throws IOException {
        this.s = SettingsFile.read(settingsFile);
        this.siteId = siteId;
        this.serverUri = serverUri;
        this.say = say;
    }

    /** For role {@code units}: this host serves the units whose index modulo {@code shares} is {@code share}. */
    public BusPart unitShare(int share, int shares) {
        this.unitShare = share;
        this.unitShares = shares;
        return this;
    }

    /** @param role {@code plant}, {@code controller} or {@code units}; @return exit code */
    public int run(String role, InputStream orderStream) throws Exception {
        Thread reader = new Thread(() -> readOrders(orderStream), "bench-part-orders");
        reader.setDaemon(true);
        reader.start();
        Path site = s.outDir().resolve("site.yaml");
        StampingBus.CommandTally tally = new StampingBus.CommandTally();
        ResourceSampler sampler = new ResourceSampler(clock, OptionalLong.empty());
        Map<String, Long> counters = new LinkedHashMap<>();
        Map<String, Histogram> histograms = new LinkedHashMap<>();
        String failure;
        if ("plant".equals(role)) {
            PlantSide plant = new PlantSide(s, SiteLoader.load(site), serverUri, null, tally, clock, say);
            plant.awaitConnected();
            plant.start();
            say.accept(READY + " plant, " + plant.connections() + " connections, telemetry " + plant.telemetryBytes()
                    + " B, step " + plant.stepS() + " s");
            waitFor("mark", sampler, null);
            Histogram atMark = plant.latenessUs();
            long publishedAtMark = tally.measuredPublished.sum();
            long fieldAtMark = tally.fieldPublished.sum();
            sampler.reset();
            waitFor("end", sampler, plant::failure);
            Histogram lateness = plant.latenessUs();
            lateness.subtract(atMark);
            histograms.put("stepLatenessUs", lateness);
            counters.put("measuredPublishedInWindow", tally.measuredPublished.sum() - publishedAtMark);
            counters.put("fieldPublishedInWindow", tally.fieldPublished.sum() - fieldAtMark);
            keepServingUntilStop(sampler, plant::failure);
            counters.put("measuredPublished", tally.measuredPublished.sum());
            counters.put("commandsArrived", tally.commandsArrived.sum());
            counters.put("acksPublished", tally.acksPublished.sum());
            counters.put("connections", (long) plant.connections());
            counters.put("telemetryBytes", (long) plant.telemetryBytes());
            counters.put("dropped", plant.counters().dropped());
            counters.put("sendFailed", plant.counters().sendFailed());
            failure = plant.failure() == null ? null : plant.failure().toString();
            plant.close();
        } else if ("controller".equals(role)) {
            ControllerSide ctl = new ControllerSide(s, ControllerSiteReader.read(site), siteId, serverUri, null, tally,
                    clock, s.outDir().resolve("controller.hlog"));
            ctl.start();
            say.accept(READY + " controller");
            waitFor("mark", sampler, null);
            ProbedController probed = ctl.probed();
            probed.unitAgeMs.getIntervalHistogram();
            probed.meterAgeMs.getIntervalHistogram();
            probed.cycleWorkUs.getIntervalHistogram();
            long routedAtMark = ctl.agent().intake().messagesRouted();
            long cyclesAtMark = ctl.agent().cyclesRun();
            long[] atMark = {tally.telemetryReceived.sum(), tally.metersReceived.sum(), tally.commandsPublished.sum(),
                    tally.acksReceived.sum()};
            counters.put("markEpochMs", clock.epochMillis());
            sampler.reset();
            waitFor("stop", sampler, () -> ctl.isRunning() ? null : new IllegalStateException("controller stopped"));
            histograms.put("unitTelemetryAgeMs", probed.unitAgeMs.getIntervalHistogram());
            histograms.put("areaFrequencyAgeMs", probed.meterAgeMs.getIntervalHistogram());
            histograms.put("cycleWorkUs", probed.cycleWorkUs.getIntervalHistogram());
            counters.put("routedInWindow", ctl.agent().intake().messagesRouted() - routedAtMark);
            counters.put("cyclesInWindow", ctl.agent().cyclesRun() - cyclesAtMark);
            counters.put("telemetryReceivedInWindow", tally.telemetryReceived.sum() - atMark[0]);
            counters.put("metersReceivedInWindow", tally.metersReceived.sum() - atMark[1]);
            counters.put("commandsPublishedInWindow", tally.commandsPublished.sum() - atMark[2]);
            counters.put("acksReceivedInWindow", tally.acksReceived.sum() - atMark[3]);
            ctl.stopCycles();
            counters.putAll(ctl.inputSeqCounts());
            LockSupport.parkNanos(3_000_000_000L); // the last commands' acks come back
            counters.put("commandsPublished", tally.commandsPublished.sum());
            counters.put("commandsPubacked", tally.commandsPubacked.sum());
            counters.put("commandsFailed", tally.commandsFailed.sum());
            counters.put("acksReceived", tally.acksReceived.sum());
            counters.put("dropped", ctl.counters().dropped());
            tally.failedByReason.forEach((k, v) -> counters.put("failed." + k, v.sum()));
            ctl.agent().intake().rejectedByReason().forEach((k, v) -> counters.put("rejected." + k, ((Number) v).longValue()));
            failure = null;
            ctl.closeBus();
        } else if ("units".equals(role)) {
            failure = runUnits(site, sampler, counters, histograms);
        } else {
            say.accept("bench: --role must be plant, controller or units, got " + role);
            return 2;
        }
        new PartFigures(counters, histograms, sampler.samples(), failure).write(s.outDir(), partName(role, unitShare));
        say.accept(DONE);
        return failure == null ? 0 : 1;
    }

    private String runUnits(Path site, ResourceSampler sampler, Map<String, Long> counters,
                            Map<String, Histogram> histograms) throws Exception {
        try (UnitHost host = new UnitHost(s, SiteLoader.load(site), serverUri, unitShare, unitShares, clock)) {
            StampingBus.CommandTally t = host.tally;
            host.start();
            say.accept(READY + " units " + unitShare + "/" + unitShares + ", " + host.unitCount() + " units on "
                    + host.connections() + " connections");
            waitFor("mark", sampler, null);
            host.latencyIntervalMs();
            long[] atMark = {t.measuredPublished.sum(), t.acksPublished.sum(), t.commandsArrived.sum(),
                    t.fieldPublished.sum(), host.fieldReadingsReceived.sum()};
            sampler.reset();
            java.util.function.Supplier<Throwable> stopped = () -> host.isRunning() ? null
                    : new IllegalStateException("unit host scan stopped");
            waitFor("end", sampler, stopped);
            histograms.put("commandLatencyMs", host.latencyIntervalMs());
            counters.put("telemetryPublishedInWindow", t.measuredPublished.sum() - atMark[0]);
            counters.put("acksPublishedInWindow", t.acksPublished.sum() - atMark[1]);
            counters.put("commandsArrivedInWindow", t.commandsArrived.sum() - atMark[2]);
            counters.put("fieldReferencesPublishedInWindow", t.fieldPublished.sum() - atMark[3]);
            counters.put("fieldReadingsReceivedInWindow", host.fieldReadingsReceived.sum() - atMark[4]);
            keepServingUntilStop(sampler, stopped);
            Histogram tail = host.latencyIntervalMs();
            histograms.put("commandLatencyAfterWindowMs", tail);
            counters.put("units", (long) host.unitCount());
            counters.put("connections", (long) host.connections());
            counters.put("unitsCommanded", (long) host.unitsCommanded.size());
            counters.put("commandsArrived", t.commandsArrived.sum());
            counters.put("acksPublished", t.acksPublished.sum());
            counters.put("routedToUnits", host.router.routedCount());
            counters.put("droppedNotServed", host.router.notServedCount());
            counters.put("droppedNotParsed", host.router.notParsedCount());
            host.acksRejectedByReason.forEach((k, v) -> counters.put("acksRejected." + k, v.sum()));
            return host.isRunning() ? null : "unit host scan stopped";
        }
    }

    /** @return the name of a part's figures files: its role, a unit host's with its share ({@code units-0}) */
    static String partName(String role, int unitShare) {
        return "units".equals(role) ? "units-" + unitShare : role;
    }

    /** After {@code end}: waits for {@code stop} unless {@code stop} already came. */
    private void keepServingUntilStop(ResourceSampler sampler, java.util.function.Supplier<Throwable> failure)
            throws InterruptedException {
        if (!"stop".equals(lastOrder)) {
            waitFor("stop", sampler, failure);
        }
    }

    private void readOrders(InputStream in) {
        try (BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
            for (String line; (line = r.readLine()) != null; ) {
                orders.add(line.trim());
            }
        } catch (IOException e) {
            // the bench went away: stop
        }
        orders.add("stop");
    }

    /** Waits for the order, sampling heap and CPU every sample period; a failure or a closed input ends the wait. */
    private void waitFor(String order, ResourceSampler sampler, java.util.function.Supplier<Throwable> failure)
            throws InterruptedException {
        long period = Math.round(s.sampleS() * 1e9);
        long next = clock.monotonicNanos() + period;
        while (true) {
            String o = orders.poll(200, TimeUnit.MILLISECONDS);
            if (o != null && (o.equals(order) || o.equals("stop"))) {
                lastOrder = o;
                return;
            }
            if (failure != null && failure.get() != null) {
                say.accept("bench: part failed: " + failure.get());
                lastOrder = "stop";
                return;
            }
            if (clock.monotonicNanos() >= next) {
                ResourceSampler.Sample x = sampler.sample();
                say.accept(String.format(java.util.Locale.ROOT, "bench: t=%.0f s heap after GC %.0f MB, JVM CPU %.0f %%",
                        x.tS(), x.heapAfterGcBytes() / 1e6, x.jvmCpuPct()));
                next += period;
            }
        }
    }
}
