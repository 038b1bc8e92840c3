package org.loopstand.bench.run;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintStream;
import java.io.Reader;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Properties;
import java.util.TreeMap;
import org.HdrHistogram.EncodableHistogram;
import org.HdrHistogram.Histogram;
import org.HdrHistogram.HistogramLogReader;
import org.HdrHistogram.HistogramLogWriter;

/**
 * What one bench process (plant or controller, layout processes) measured over the window: counters,
 * histograms and heap/CPU samples, written at its end as {@code part-ROLE.properties} and
 * {@code part-ROLE.hlog} in the run folder and read back by the bench.
 */
record PartFigures(Map<String, Long> counters, Map<String, Histogram> histograms, List<ResourceSampler.Sample> samples,
                   String failure) {

    long counter(String name) {
        Long v = counters.get(name);
        if (v == null) {
            throw new IllegalStateException("the part wrote no counter " + name);
        }
        return v;
    }

    Histogram histogram(String tag) {
        return histograms.get(tag);
    }

    void write(Path dir, String role) throws IOException {
        Properties p = new Properties();
        counters.forEach((k, v) -> p.setProperty("counter." + k, Long.toString(v)));
        for (int i = 0; i < samples.size(); i++) {
            ResourceSampler.Sample x = samples.get(i);
            p.setProperty(String.format(java.util.Locale.ROOT, "sample.%04d", i), x.tS() + "," + x.heapAfterGcBytes() + ","
                    + x.heapUsedBytes() + "," + x.jvmCpuPct());
        }
        if (failure != null) {
            p.setProperty("failure", failure);
        }
        try (Writer w = Files.newBufferedWriter(dir.resolve("part-" + role + ".properties"), StandardCharsets.UTF_8)) {
            p.store(w, role + " figures");
        }
        try (PrintStream out = new PrintStream(Files.newOutputStream(dir.resolve("part-" + role + ".hlog")), true, "UTF-8")) {
            HistogramLogWriter w = new HistogramLogWriter(out);
            w.outputLogFormatVersion();
            histograms.forEach((tag, h) -> {
                h.setTag(tag);
                w.outputIntervalHistogram(h);
            });
        }
    }

    static PartFigures read(Path dir, String role) throws IOException {
        Properties p = new Properties();
        try (Reader r = Files.newBufferedReader(dir.resolve("part-" + role + ".properties"), StandardCharsets.UTF_8)) {
            p.load(r);
        }
        Map<String, Long> counters = new TreeMap<>();
        Map<String, String> sampleLines = new TreeMap<>();
        for (String k : p.stringPropertyNames()) {
            if (k.startsWith("counter.")) {
                counters.put(k.substring("counter.".length()), Long.parseLong(p.getProperty(k)));
            } else if (k.startsWith("sample.")) {
                sampleLines.put(k, p.getProperty(k));
            }
        }
        List<ResourceSampler.Sample> samples = new ArrayList<>();
        for (String line : sampleLines.values()) {
            String[] f = line.split(",");
            samples.add(new ResourceSampler.Sample(Double.parseDouble(f[0]), Long.parseLong(f[1]), Long.parseLong(f[2]),
                    Double.parseDouble(f[3]), Double.NaN));
        }
        Map<String, Histogram> histograms = new TreeMap<>();
        try (InputStream in = Files.newInputStream(dir.resolve("part-" + role + ".hlog"));
             HistogramLogReader r = new HistogramLogReader(in)) {
            EncodableHistogram eh;
            while ((eh = r.nextIntervalHistogram()) != null) {
                if (eh instanceof Histogram h) {
                    histograms.put(h.getTag(), h);
                }
            }
        }
        return new PartFigures(counters, histograms, samples, p.getProperty("failure"));
    }
}
