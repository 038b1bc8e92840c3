package org.loopstand.bench.run;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.HdrHistogram.Histogram;

/**
 * The figures of one hosts bench run (layout hosts), put together from the parts' own counts: rates per topic
 * family over the measured window, the command path's counts from end to end over the whole run, the telemetry
 * and meter gaps the controller's sequence tracking found, the command latency at the unit hosts, and each
 * process's CPU (share of one core over the window) and resident memory.
 *
 * @param windowS       measured window, wall s
 * @param ratesPerS     messages per second by family and side, over the window
 * @param commands      the command path over the whole run: sent, PUBACK failed, arrived at units, acks published,
 *                      acks received, lost (sent − arrived, never below 0), duplicates (arrived − sent, never below 0)
 * @param acksRejected  acks saying "rejected", by reason
 * @param inputSeq      unit telemetry and meters taken and missing by sequence number at the controller (whole run)
 * @param latencyMs     command issuedAt → arrival at its unit host, ms, over the window, both unit hosts
 * @param unitsPerHost  units each unit host served, and how many of them received at least one command
 * @param cpuPct        each process's CPU over the window, % of one core
 * @param residentBytes each process's resident memory at the end of the window
 * @param readyS        each part's set-up: from its process start to ready (connected, every subscription
 *                      acknowledged), wall s; the unit hosts start together, after the plant is ready
 * @param heapAfterGcBytes the largest heap after GC each part sampled (not the broker nodes)
 * @param load1MinBefore machine's 1-minute load average before the run
 * @param load1MinAfter  and after the window
 * @param nodes         each broker node's own figures over the window ({@link NodeFigures#summary}): messages in from
 *                      clients and peers, delivered to clients, forwarded to peers, expired, killed, held at the end
 * @param nodeFamilies  each node's window counts by topic family
 */
public record HostsResult(BenchSettings settings, double windowS, Map<String, Double> ratesPerS, Map<String, Long> commands,
                          Map<String, Long> acksRejected, Map<String, Long> inputSeq, Histogram latencyMs,
                          Map<String, Map<String, Long>> unitsPerHost, Map<String, Double> cpuPct,
                          Map<String, Long> residentBytes, Map<String, Double> readyS, Map<String, Long> heapAfterGcBytes,
                          double load1MinBefore,
                          double load1MinAfter, String plantFailure, Map<String, Map<String, Long>> nodes,
                          Map<String, Map<String, Map<String, Long>>> nodeFamilies) {

    static HostsResult of(BenchSettings s, double windowS, Map<String, Double> cpuPct, Map<String, Long> resident,
                          Map<String, Double> readyS,
                          double loadBefore, double loadAfter, PartFigures plant, PartFigures ctl, List<PartFigures> units,
                          List<NodeFigures> nodeFigures, long commandsExpiredInBroker) {
        Map<String, Double> rates = new LinkedHashMap<>();
        rates.put("telemetry published (unit hosts)", sum(units, "telemetryPublishedInWindow") / windowS);
        rates.put("telemetry received (controller)", ctl.counter("telemetryReceivedInWindow") / windowS);
        rates.put("commands sent (controller)", ctl.counter("commandsPublishedInWindow") / windowS);
        rates.put("commands arrived (unit hosts)", sum(units, "commandsArrivedInWindow") / windowS);
        rates.put("acks published (unit hosts)", sum(units, "acksPublishedInWindow") / windowS);
        rates.put("acks received (controller)", ctl.counter("acksReceivedInWindow") / windowS);
        rates.put("meter readings published (plant)", plant.counter("measuredPublishedInWindow") / windowS);
        rates.put("meter readings received (controller)", ctl.counter("metersReceivedInWindow") / windowS);
        rates.put("field readings published (plant)", plant.counter("fieldPublishedInWindow") / windowS);
        rates.put("field readings received (unit hosts)", sum(units, "fieldReadingsReceivedInWindow") / windowS);
        rates.put("field references published (unit hosts)", sum(units, "fieldReferencesPublishedInWindow") / windowS);
        Map<String, Long> commands = new LinkedHashMap<>();
        long sent = ctl.counter("commandsPublished");
        long arrived = (long) sum(units, "commandsArrived");
        commands.put("sent", sent);
        commands.put("pubackFailed", ctl.counter("commandsFailed"));
        commands.put("arrived", arrived);
        commands.put("acksPublished", (long) sum(units, "acksPublished"));
        commands.put("acksReceived", ctl.counter("acksReceived"));
        // a command a node expired (its MQTT expiry, the command's validity, ran out in a queue) was not lost: the
        // node did what it was told; lost is what is left unaccounted
        commands.put("expiredInBroker", commandsExpiredInBroker);
        commands.put("lost", Math.max(0, sent - arrived - commandsExpiredInBroker));
        commands.put("duplicates", Math.max(0, arrived - sent));
        Map<String, Long> rejected = new LinkedHashMap<>();
        for (PartFigures u : units) {
            u.counters().forEach((k, v) -> {
                if (k.startsWith("acksRejected.")) {
                    rejected.merge(k.substring("acksRejected.".length()), v, Long::sum);
                }
            });
        }
        Map<String, Long> seq = new LinkedHashMap<>();
        for (String k : List.of("telemetryTaken", "telemetryMissing", "metersTaken", "metersMissing", "telemetryOutOfOrder",
                "metersOutOfOrder")) {
            seq.put(k, ctl.counters().getOrDefault(k, -1L));
        }
        // a message that comes after a later one of its source is counted missing when the later one is taken, then
        // out of order when it comes: missing − out of order is what never came (duplicates aside)
        seq.put("telemetryNeverArrived", Math.max(0, seq.get("telemetryMissing") - Math.max(0, seq.get("telemetryOutOfOrder"))));
        seq.put("metersNeverArrived", Math.max(0, seq.get("metersMissing") - Math.max(0, seq.get("metersOutOfOrder"))));
        Histogram latency = new Histogram(3);
        Map<String, Map<String, Long>> perHost = new LinkedHashMap<>();
        Map<String, Long> heap = new LinkedHashMap<>();
        heap.put("plant", maxHeap(plant));
        for (int i = 0; i < units.size(); i++) {
            PartFigures u = units.get(i);
            latency.add(u.histogram("commandLatencyMs"));
            perHost.put("units-" + i, Map.of("units", u.counter("units"), "unitsCommanded", u.counter("unitsCommanded"),
                    "connections", u.counter("connections"), "routedToUnits", u.counter("routedToUnits"),
                    "droppedNotServed", u.counter("droppedNotServed"), "droppedNotParsed", u.counter("droppedNotParsed")));
            heap.put("units-" + i, maxHeap(u));
        }
        heap.put("controller", maxHeap(ctl));
        Map<String, String> names = new LinkedHashMap<>();
        nodeFigures.forEach(n -> names.put(n.nodeId(), n.name()));
        Map<String, Map<String, Long>> nodes = new LinkedHashMap<>();
        Map<String, Map<String, Map<String, Long>>> families = new LinkedHashMap<>();
        for (NodeFigures n : nodeFigures) {
            nodes.put(n.name(), n.summary(names));
            families.put(n.name(), n.byFamily());
        }
        return new HostsResult(s, windowS, rates, commands, rejected, seq, latency, perHost, cpuPct, resident, readyS, heap,
                loadBefore, loadAfter, plant.failure(), nodes, families);
    }

    private static double sum(List<PartFigures> parts, String counter) {
        return parts.stream().mapToLong(p -> p.counter(counter)).sum();
    }

    private static long maxHeap(PartFigures p) {
        return p.samples().stream().mapToLong(ResourceSampler.Sample::heapAfterGcBytes).max().orElse(-1);
    }

    public long commandsSent() {
        return commands.get("sent");
    }

    public long commandsArrived() {
        return commands.get("arrived");
    }

    public long commandsLost() {
        return commands.get("lost");
    }

    public long acksPublished() {
        return commands.get("acksPublished");
    }

    public long acksReceived() {
        return commands.get("acksReceived");
    }

    /** Writes {@code hosts-result.json} and {@code hosts-table.txt} in the run folder. */
    public void write(Path dir) throws IOException {
        Map<String, Object> json = new LinkedHashMap<>();
        json.put("units", settings.units());
        json.put("areas", settings.areas());
        json.put("windowS", windowS);
        json.put("ratesPerS", ratesPerS);
        json.put("commands", commands);
        json.put("acksRejected", acksRejected);
        json.put("inputSeq", inputSeq);
        json.put("commandLatencyMs", Map.of("count", latencyMs.getTotalCount(), "p50", latencyMs.getValueAtPercentile(50),
                "p99", latencyMs.getValueAtPercentile(99), "max", latencyMs.getMaxValue()));
        json.put("unitsPerHost", unitsPerHost);
        json.put("cpuPctOfOneCore", cpuPct);
        json.put("residentBytes", residentBytes);
        json.put("readyS", readyS);
        json.put("heapAfterGcBytes", heapAfterGcBytes);
        json.put("load1MinBefore", load1MinBefore);
        json.put("load1MinAfter", load1MinAfter);
        json.put("plantFailure", plantFailure);
        json.put("brokerNodes", nodes);
        json.put("brokerNodesByFamily", nodeFamilies);
        new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValue(dir.resolve("hosts-result.json").toFile(), json);
        try (PrintStream out = new PrintStream(Files.newOutputStream(dir.resolve("hosts-table.txt")), true, "UTF-8")) {
            print(out);
        }
    }

    public void print(PrintStream out) {
        out.printf(Locale.ROOT, "hosts bench: %d units, %d areas, window %.1f s, load (1 min) %.2f before, %.2f after%n",
                settings.units(), settings.areas(), windowS, load1MinBefore, load1MinAfter);
        out.println("rates, messages/s:");
        ratesPerS.forEach((k, v) -> out.printf(Locale.ROOT, "  %-42s %10.1f%n", k, v));
        out.println("command path (whole run): " + commands);
        out.println("acks rejected by reason: " + acksRejected);
        long tTaken = inputSeq.get("telemetryTaken");
        long tMissing = inputSeq.get("telemetryMissing");
        long mTaken = inputSeq.get("metersTaken");
        long mMissing = inputSeq.get("metersMissing");
        out.printf(Locale.ROOT, "telemetry at the controller: %d taken, %d missing by seq (%.3f %%); meters: %d taken, %d missing"
                + " (%.3f %%)%n", tTaken, tMissing, pct(tMissing, tTaken + tMissing), mTaken, mMissing, pct(mMissing, mTaken + mMissing));
        out.printf(Locale.ROOT, "  of them arrived late (behind a later seq of the same source; the controller does not use them):"
                + " telemetry %d, meters %d; so never arrived: telemetry %d, meters %d%n",
                inputSeq.get("telemetryOutOfOrder"), inputSeq.get("metersOutOfOrder"),
                inputSeq.get("telemetryNeverArrived"), inputSeq.get("metersNeverArrived"));
        out.printf(Locale.ROOT, "command latency issuedAt → unit host, ms: p50 %d, p99 %d, max %d (%d commands)%n",
                latencyMs.getValueAtPercentile(50), latencyMs.getValueAtPercentile(99), latencyMs.getMaxValue(),
                latencyMs.getTotalCount());
        out.println("unit hosts: " + unitsPerHost);
        out.print("set-up, process start to ready (every SUBACK), s:");
        readyS.forEach((name, secs) -> out.printf(Locale.ROOT, " %s %.1f", name, secs));
        out.println();
        out.println("process          CPU % of a core   resident MB   heap after GC MB");
        cpuPct.forEach((name, pctCore) -> {
            Long heap = heapAfterGcBytes.get(name);
            out.printf(Locale.ROOT, "  %-14s %12.1f %13.0f %15s%n", name, pctCore, residentBytes.get(name) / 1e6,
                    heap == null ? "-" : String.format(Locale.ROOT, "%.0f", heap / 1e6));
        });
        out.println("broker nodes over the window (their own counters; held and full at the window's end):");
        nodes.forEach((name, f) -> out.println("  " + name + " " + f));
        out.println("broker nodes by topic family over the window:");
        nodeFamilies.forEach((name, f) -> out.println("  " + name + " " + f));
        if (plantFailure != null) {
            out.println("plant failure: " + plantFailure);
        }
    }

    private static double pct(long part, long whole) {
        return whole == 0 ? 0 : 100.0 * part / whole;
    }
}
