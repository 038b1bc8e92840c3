package org.loopstand.report.run;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.protocol.journal.HistogramLogs;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.Histogram;

/** Latency and jitter histograms: from the run's {@code *.hlog} files and from the controller journal. */
final class RunHistograms {
    static final int BUCKETS = 12;

    private RunHistograms() {
    }

    static List<Histogram> of(RunFolder run, List<JournalEntry> ctl) {
        List<Histogram> out = new ArrayList<>();
        double[] latency = commandLatencyMs(ctl);
        if (latency.length > 0) {
            out.add(linear("Command latency end to end (controller: sent → ack received), scenario ms", "ms", latency));
        }
        for (String process : List.of("controller", "plant")) {
            Path log = run.folder().resolve(process + ".hlog");
            if (!Files.isRegularFile(log)) {
                continue;
            }
            HistogramLogs.Totals totals = HistogramLogs.readTotals(log);
            totals.histograms().forEach((tag, h) -> {
                if (h.getTotalCount() > 0) {
                    out.add(fromHdr(process + ": " + tag + (totals.tornTail() ? " (log torn at the end)" : ""), unitOf(tag), h));
                }
            });
        }
        return out;
    }

    /** @return for each acknowledged command, ack time − sent time, ms (both on the controller's clock) */
    static double[] commandLatencyMs(List<JournalEntry> ctl) {
        Map<Long, Long> sentAt = new HashMap<>();
        List<Double> out = new ArrayList<>();
        for (JournalEntry e : ctl) {
            if (e.kind().equals("sent") && e.number("seq").isPresent()) {
                sentAt.put((long) e.number("seq").getAsDouble(), e.tMs());
            } else if ((e.kind().equals("received") || e.kind().equals("refused")) && e.fields().has("ack")
                    && e.number("commandSeq").isPresent()) {
                Long s = sentAt.remove((long) e.number("commandSeq").getAsDouble());
                if (s != null) {
                    out.add((double) Math.max(0, e.tMs() - s));
                }
            }
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }

    static Histogram linear(String title, String unit, double[] values) {
        double max = 0;
        for (double v : values) {
            max = Math.max(max, v);
        }
        double width = niceWidth(max / BUCKETS);
        int n = (int) Math.max(1, Math.ceil(max / width + 1e-9));
        double[] bounds = new double[n];
        long[] counts = new long[n];
        for (int i = 0; i < n; i++) {
            bounds[i] = (i + 1) * width;
        }
        for (double v : values) {
            counts[Math.min(n - 1, (int) Math.floor(v / width))]++;
        }
        return new Histogram(title, unit, bounds, counts);
    }

    private static Histogram fromHdr(String title, String unit, org.HdrHistogram.Histogram h) {
        double scale = "µs".equals(unit) && h.getValueAtPercentile(99.9) > 10_000 ? 1000.0 : 1.0; // show ms when large
        String shown = scale == 1.0 ? unit : "ms";
        double top = h.getValueAtPercentile(99.9) / scale;
        double width = niceWidth(Math.max(1, top) / BUCKETS);
        int n = (int) Math.max(1, Math.ceil(top / width + 1e-9)) + 1; // last bucket collects the rest
        double[] bounds = new double[n];
        long[] counts = new long[n];
        for (int i = 0; i < n; i++) {
            bounds[i] = i == n - 1 ? Math.max(h.getMaxValue() / scale, (i + 1) * width) : (i + 1) * width;
        }
        for (var v : h.recordedValues()) {
            double x = v.getValueIteratedTo() / scale;
            counts[Math.min(n - 1, (int) Math.floor(x / width))] += v.getCountAtValueIteratedTo();
        }
        return new Histogram(title + (scale == 1.0 ? "" : " (shown in ms; last bar: up to the maximum)"), shown, bounds, counts);
    }

    private static String unitOf(String tag) {
        return tag.endsWith("Us") ? "µs" : tag.endsWith("Ms") ? "ms" : "";
    }

    /** @return 1, 2 or 5 × a power of ten, at least {@code raw} */
    static double niceWidth(double raw) {
        if (!(raw > 0)) {
            return 1;
        }
        double p = Math.pow(10, Math.floor(Math.log10(raw)));
        for (double m : new double[] {1, 2, 5, 10}) {
            if (m * p >= raw) {
                return m * p;
            }
        }
        return 10 * p;
    }
}
