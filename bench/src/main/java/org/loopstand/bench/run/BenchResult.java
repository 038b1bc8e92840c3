package org.loopstand.bench.run;

import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.HistogramLogWriter;

/**
 * Figures of one bench run, the table they make and the HdrHistogram log they are written to. With
 * plant and controller in separate processes the publish → validated path is not measured (its stamps
 * live in one JVM): the rig histograms are null and {@code stampsLost} is −1.
 */
public record BenchResult(BenchSettings settings, String broker, int plantConnections, int telemetryBytes,
                          double measuredS, BusBench.Counts before, BusBench.Counts after,
                          Histogram rigUs, Histogram rigArrivalUs, Histogram rawUs, Histogram unitAgeMs,
                          Histogram meterAgeMs, Histogram cycleWorkUs, Histogram jitterUs,
                          long commandsPublished, long commandsPubacked, long commandsFailed,
                          Map<String, Long> commandsFailedByReason, long commandsArrived, long acksPublished,
                          long acksReceived, long stampsLost, long controllerDropped, long plantDropped,
                          long plantSendFailed, Map<String, Long> intakeRejected,
                          Map<String, List<ResourceSampler.Sample>> samplesByProcess,
                          Histogram stepLatenessUs, String plantFailure) {

    /** @return p99 of the rig path over p99 of the raw loop, NaN without a raw loop */
    public double ratioP99() {
        return rigUs == null || rawUs == null || rawUs.getTotalCount() == 0 ? Double.NaN
                : (double) rigUs.getValueAtPercentile(99) / Math.max(1, rawUs.getValueAtPercentile(99));
    }

    /** @return commands neither acked nor reported failed */
    public long commandsUnaccounted() {
        return commandsPublished - commandsFailed - acksReceived;
    }

    private static String pct(Histogram h, String unit) {
        if (h == null || h.getTotalCount() == 0) {
            return "– | – | – | – | 0";
        }
        return String.format(Locale.ROOT, "%d | %d | %d | %d | %d", h.getValueAtPercentile(50), h.getValueAtPercentile(99),
                h.getValueAtPercentile(99.9), h.getMaxValue(), h.getTotalCount());
    }

    /** Writes the table as Markdown. */
    public void print(PrintStream out) {
        BenchSettings s = settings;
        out.printf(Locale.ROOT, "### %d units, %d areas, %s, layout %s, plant pacing %s, raw loop %s%n%n", s.units(), s.areas(),
                broker, s.layout().cliName(), s.plantPacing().cliName(), s.raw() ? s.rawPacing().cliName() : "off");
        out.printf(Locale.ROOT, "grouping %s%s (%d plant connections), %d controller intake connection(s) ($share/ctl),"
                        + " telemetry %d ms (%d B, QoS 0), meters %d ms, cycle %d s, measured %.0f s after %.0f s warm-up;"
                        + " unit scan %d ms, controller woken by its intake: %s%n%n",
                s.grouping().cliName(), s.grouping().name().equals("POOLED") ? " " + s.poolSize() : "", plantConnections,
                s.intakeConnections(), s.telemetryScanMs(), telemetryBytes, s.meterScanMs(), s.cycleS(), measuredS,
                s.warmupS(), s.unitScanMs(), s.wakeOnInput() ? "yes" : "no");
        out.println("| quantity | p50 | p99 | p99.9 | max | count |");
        out.println("|---|---|---|---|---|---|");
        out.println("| rig: publish → decoded + validated at the controller, µs | " + pct(rigUs, "µs") + " |");
        out.println("| rig: publish → arrival at the controller's link, µs | " + pct(rigArrivalUs, "µs") + " |");
        out.println("| raw Paho: publish → messageArrived, µs | " + pct(rawUs, "µs") + " |");
        out.println("| controller cycle start jitter, µs | " + pct(jitterUs, "µs") + " |");
        out.println("| age of unit telemetry at use, ms | " + pct(unitAgeMs, "ms") + " |");
        out.println("| age of area frequency at use, ms | " + pct(meterAgeMs, "ms") + " |");
        out.println("| controller cycle work (intake drain + cycle), µs | " + pct(cycleWorkUs, "µs") + " |");
        out.println("| plant physics step lateness, µs | " + pct(stepLatenessUs, "µs") + " |");
        out.println();
        double rigRate = (after.routed() - before.routed()) / measuredS;
        double stampRate = (after.stamped() - before.stamped()) / measuredS;
        double rawRate = (after.rawReceived() - before.rawReceived()) / measuredS;
        out.printf(Locale.ROOT, "- ratio p99 rig / raw: **%.2f**%n", ratioP99());
        out.printf(Locale.ROOT, "- rates: plant measured values published %.0f msg/s, controller routed %.0f msg/s"
                + " (all kinds), raw loop received %.0f msg/s%n", stampRate, rigRate, rawRate);
        out.printf(Locale.ROOT, "- loss: measured values never validated %s (of %d published), dropped in controller links %d,"
                        + " in plant links %d, plant publish failures %d, raw loop publish failures %d, raw sent − received %d%n",
                stampsLost < 0 ? "not measured (separate processes)" : Long.toString(stampsLost), after.stamped(), controllerDropped, plantDropped, plantSendFailed, after.rawFailed(),
                after.rawSent() - after.rawReceived());
        out.printf(Locale.ROOT, "- commands (QoS 1): published %d, PUBACKed %d, failed and reported %d %s, arrived at the"
                        + " plant %d, acks published %d, acks received %d, **unaccounted %d**%n",
                commandsPublished, commandsPubacked, commandsFailed, commandsFailedByReason, commandsArrived,
                acksPublished, acksReceived, commandsUnaccounted());
        out.printf(Locale.ROOT, "- intake rejections by reason: %s; cycles in the window %d%n", intakeRejected,
                after.cycles() - before.cycles());
        samplesByProcess.forEach((process, samples) -> {
            if (samples.isEmpty()) {
                return;
            }
            ResourceSampler.Sample first = samples.get(0);
            ResourceSampler.Sample last = samples.get(samples.size() - 1);
            double cpu = samples.stream().mapToDouble(ResourceSampler.Sample::jvmCpuPct).average().orElse(Double.NaN);
            double bcpu = samples.stream().mapToDouble(ResourceSampler.Sample::brokerCpuPct).filter(d -> !Double.isNaN(d))
                    .average().orElse(Double.NaN);
            long maxAfterGc = samples.stream().mapToLong(ResourceSampler.Sample::heapAfterGcBytes).max().orElse(0);
            out.printf(Locale.ROOT, "- %s: heap after GC first %.0f MB, last %.0f MB, max %.0f MB (%d samples); CPU: JVM %.0f %%"
                            + " of one core%s%n", process, first.heapAfterGcBytes() / 1e6,
                    last.heapAfterGcBytes() / 1e6, maxAfterGc / 1e6, samples.size(), cpu,
                    Double.isNaN(bcpu) ? "" : String.format(Locale.ROOT, ", broker process %.0f %% of one core", bcpu));
        });
        if (plantFailure != null) {
            out.println("- plant loop stopped on: " + plantFailure);
        }
        out.println();
    }

    /** Writes table.md, samples.csv and bench.hlog into the run folder. */
    public void write(Path dir) throws IOException {
        try (PrintStream p = new PrintStream(Files.newOutputStream(dir.resolve("table.md")), true, "UTF-8")) {
            print(p);
        }
        StringBuilder csv = new StringBuilder("process,tS,heapAfterGcBytes,heapUsedBytes,jvmCpuPct,brokerCpuPct\n");
        samplesByProcess.forEach((process, samples) -> {
            for (ResourceSampler.Sample x : samples) {
                csv.append(String.format(Locale.ROOT, "%s,%.1f,%d,%d,%.1f,%.1f%n", process, x.tS(), x.heapAfterGcBytes(),
                        x.heapUsedBytes(), x.jvmCpuPct(), x.brokerCpuPct()));
            }
        });
        Files.writeString(dir.resolve("samples.csv"), csv);
        try (PrintStream p = new PrintStream(Files.newOutputStream(dir.resolve("bench.hlog")), true, "UTF-8")) {
            HistogramLogWriter w = new HistogramLogWriter(p);
            w.outputLogFormatVersion();
            w.outputLegend();
            put(w, "rigPublishToValidatedUs", rigUs);
            put(w, "rigPublishToArrivalUs", rigArrivalUs);
            put(w, "rawPublishToArrivedUs", rawUs);
            put(w, "unitTelemetryAgeMs", unitAgeMs);
            put(w, "areaFrequencyAgeMs", meterAgeMs);
            put(w, "cycleStartJitterUs", jitterUs);
            put(w, "stepLatenessUs", stepLatenessUs);
        }
    }

    private static void put(HistogramLogWriter w, String tag, Histogram h) {
        if (h != null) {
            h.setTag(tag);
            w.outputIntervalHistogram(h);
        }
    }
}
