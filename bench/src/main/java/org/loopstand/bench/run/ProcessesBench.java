package org.loopstand.bench.run;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.locks.LockSupport;
import java.util.function.Consumer;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.HdrHistogram.Histogram;
import org.loopstand.bench.broker.BenchBroker;
import org.loopstand.bench.raw.RawPahoLoop;
import org.loopstand.bench.site.SiteGenerator;
import org.loopstand.protocol.time.Clock;
import org.loopstand.protocol.time.WallClock;

/**
 * A bench run with plant and controller each in a process of its own (layout processes), as in
 * production: the broker (its own process, or embedded in this JVM), the raw loop in this JVM. The
 * processes measure themselves ({@link BusPart}); this JVM orders the window and puts the figures together.
 */
public final class ProcessesBench {
    private static final Pattern READY_LINE = Pattern.compile("telemetry (\\d+) B, step ([0-9.Ee-]+) s");

    private final BenchSettings s;
    private final Consumer<String> say;
    private final List<String> partMain;
    private final Clock clock = WallClock.INSTANCE;

    /**
     * @param partMain the main class and sub-command that run one part ({@link BusPart}) in a JVM of its own;
     *                 given by the command line, which owns the entry point
     */
    public ProcessesBench(BenchSettings settings, Consumer<String> say, List<String> partMain) {
        this.s = settings;
        this.say = say;
        this.partMain = List.copyOf(partMain);
    }

    public BenchResult run() throws Exception {
        Files.createDirectories(s.outDir());
        String siteId = "bench-" + s.units();
        SiteGenerator.write(s.outDir().resolve("site.yaml"), siteId, s.units(), s.areas(), s.cycleS());
        Path settingsFile = s.outDir().resolve("bench-settings.properties");
        SettingsFile.write(s, settingsFile);
        try (BenchBroker broker = BenchBroker.start(s.broker(), s.brokerConfig(), s.outDir());
             PartProcess ctl = PartProcess.start("controller", partMain, s, settingsFile, siteId, broker.serverUri())) {
            say.accept("bench: broker " + broker.kind() + " at " + broker.serverUri() + "; controller process " + ctl.pid());
            ctl.awaitReady(120);
            try (PartProcess plant = PartProcess.start("plant", partMain, s, settingsFile, siteId, broker.serverUri())) {
                Matcher m = READY_LINE.matcher(plant.awaitReady(180));
                if (!m.find()) {
                    throw new IllegalStateException("plant process's ready line without telemetry size and step");
                }
                int telemetryBytes = Integer.parseInt(m.group(1));
                double stepS = Double.parseDouble(m.group(2));
                say.accept("bench: layout processes, " + s.units() + " units, " + s.areas() + " areas; plant process "
                        + plant.pid() + ", telemetry " + telemetryBytes + " B");
                RawPahoLoop raw = s.raw() ? BusBench.rawLoop(s, broker.serverUri(), telemetryBytes, stepS, clock) : null;
                ResourceSampler sampler = new ResourceSampler(clock, broker.pid());
                LockSupport.parkNanos(Math.round(s.warmupS() * 1e9));
                if (raw != null) {
                    raw.roundTripUs().getIntervalHistogram();
                }
                BusBench.Counts before = rawCounts(raw, 0, 0);
                ctl.order("mark");
                plant.order("mark");
                sampler.reset();
                long t0 = clock.monotonicNanos();
                long end = t0 + Math.round(s.durationS() * 1e9);
                long period = Math.round(s.sampleS() * 1e9);
                for (long next = t0 + period; clock.monotonicNanos() < end; ) {
                    LockSupport.parkNanos(Math.max(1, Math.min(end, next) - clock.monotonicNanos()));
                    if (clock.monotonicNanos() >= next) {
                        var x = sampler.sample();
                        say.accept(String.format(java.util.Locale.ROOT, "bench: t=%.0f s broker CPU %.0f %%, bench JVM CPU %.0f %%",
                                x.tS(), x.brokerCpuPct(), x.jvmCpuPct()));
                        next += period;
                    }
                }
                double measuredS = (clock.monotonicNanos() - t0) / 1e9;
                if (sampler.samples().isEmpty()) {
                    sampler.sample();
                }
                Histogram rawH = raw == null ? null : raw.roundTripUs().getIntervalHistogram();
                BusBench.Counts rawAfter = rawCounts(raw, 0, 0);
                if (raw != null) {
                    raw.close();
                }
                ctl.order("stop");
                ctl.awaitDone(60);
                plant.order("stop");
                plant.awaitDone(60);
                return result(broker.kind(), measuredS, before, rawAfter, rawH, sampler.samples());
            }
        }
    }

    private BenchResult result(String brokerKind, double measuredS, BusBench.Counts before, BusBench.Counts rawAfter,
                               Histogram rawH, List<ResourceSampler.Sample> benchSamples) throws Exception {
        PartFigures c = PartFigures.read(s.outDir(), "controller");
        PartFigures p = PartFigures.read(s.outDir(), "plant");
        BusBench.Counts after = new BusBench.Counts(c.counter("routedInWindow"), p.counter("measuredPublishedInWindow"), 0,
                rawAfter.rawSent(), rawAfter.rawReceived(), rawAfter.rawFailed(), c.counter("cyclesInWindow"));
        Map<String, Long> failed = new TreeMap<>();
        Map<String, Long> rejected = new TreeMap<>();
        c.counters().forEach((k, v) -> {
            if (k.startsWith("failed.")) {
                failed.put(k.substring(7), v);
            } else if (k.startsWith("rejected.")) {
                rejected.put(k.substring(9), v);
            }
        });
        Map<String, List<ResourceSampler.Sample>> samples = new LinkedHashMap<>();
        samples.put("controller process", c.samples());
        samples.put("plant process", p.samples());
        samples.put("bench JVM (raw loop" + ("embedded".equals(s.broker()) ? ", embedded broker)" : ")"), benchSamples);
        Histogram jitter = JitterLog.since(s.outDir().resolve("controller.hlog"), c.counter("markEpochMs"));
        return new BenchResult(s, brokerKind, (int) p.counter("connections"), (int) p.counter("telemetryBytes"), measuredS,
                before, after, null, null, rawH, c.histogram("unitTelemetryAgeMs"), c.histogram("areaFrequencyAgeMs"),
                c.histogram("cycleWorkUs"), jitter, c.counter("commandsPublished"), c.counter("commandsPubacked"),
                c.counter("commandsFailed"), failed, p.counter("commandsArrived"), p.counter("acksPublished"),
                c.counter("acksReceived"), -1, c.counter("dropped"), p.counter("dropped"), p.counter("sendFailed"),
                rejected, samples, p.histogram("stepLatenessUs"), p.failure());
    }

    private static BusBench.Counts rawCounts(RawPahoLoop raw, long routed, long cycles) {
        return new BusBench.Counts(routed, 0, 0, raw == null ? 0 : raw.sent(), raw == null ? 0 : raw.received(),
                raw == null ? 0 : raw.failed(), cycles);
    }
}
