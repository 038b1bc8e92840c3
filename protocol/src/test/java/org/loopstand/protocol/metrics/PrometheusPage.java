package org.loopstand.protocol.metrics;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * A strict reader of the Prometheus text exposition format 0.0.4 (rules from the format's published
 * description, "Exposition formats", prometheus.io; from memory): HELP/TYPE comments, then samples
 * {@code name{label="value",…} number}. Any other line, a sample before its TYPE, a bad label or a
 * bad number is an error.
 */
public final class PrometheusPage {
    public record Sample(String name, Map<String, String> labels, double value) {
    }

    private static final Pattern SAMPLE = Pattern.compile("^([a-zA-Z_:][a-zA-Z0-9_:]*)(?:\\{(.*)\\})? (\\S+)$");
    private static final Pattern LABEL = Pattern.compile("([a-zA-Z_][a-zA-Z0-9_]*)=\"((?:[^\"\\\\]|\\\\.)*)\"(,|$)");
    private static final Pattern TYPE = Pattern.compile("^# TYPE ([a-zA-Z_:][a-zA-Z0-9_:]*) (counter|gauge|summary|histogram|untyped)$");
    private static final Pattern HELP = Pattern.compile("^# HELP ([a-zA-Z_:][a-zA-Z0-9_:]*) .*$");

    public final Map<String, String> types = new HashMap<>();
    public final List<Sample> samples = new ArrayList<>();

    public static PrometheusPage parse(String text) {
        PrometheusPage p = new PrometheusPage();
        int n = 0;
        for (String line : text.split("\n", -1)) {
            n++;
            if (line.isEmpty()) {
                continue;
            }
            Matcher t = TYPE.matcher(line);
            if (t.matches()) {
                if (p.types.put(t.group(1), t.group(2)) != null) {
                    throw new IllegalArgumentException("line " + n + ": second TYPE for " + t.group(1));
                }
                continue;
            }
            if (HELP.matcher(line).matches()) {
                continue;
            }
            Matcher s = SAMPLE.matcher(line);
            if (!s.matches()) {
                throw new IllegalArgumentException("line " + n + " is not a sample: " + line);
            }
            String name = s.group(1);
            String family = p.types.containsKey(name) ? name : name.replaceFirst("_(sum|count)$", "");
            if (!p.types.containsKey(family)) {
                throw new IllegalArgumentException("line " + n + ": sample " + name + " before its TYPE");
            }
            Map<String, String> labels = new LinkedHashMap<>();
            if (s.group(2) != null) {
                Matcher l = LABEL.matcher(s.group(2));
                int end = 0;
                while (l.find() && l.start() == end) {
                    labels.put(l.group(1), l.group(2).replace("\\\"", "\"").replace("\\n", "\n").replace("\\\\", "\\"));
                    end = l.end();
                }
                if (end != s.group(2).length()) {
                    throw new IllegalArgumentException("line " + n + ": bad labels " + s.group(2));
                }
            }
            String v = s.group(3);
            double value = switch (v) {
                case "+Inf" -> Double.POSITIVE_INFINITY;
                case "-Inf" -> Double.NEGATIVE_INFINITY;
                case "NaN" -> Double.NaN;
                default -> Double.parseDouble(v);
            };
            p.samples.add(new Sample(name, labels, value));
        }
        return p;
    }

    /** @return the value of the sample with exactly these labels, or 0 when absent (a counter never counted) */
    public double value(String name, String... labelPairs) {
        Map<String, String> want = new LinkedHashMap<>();
        for (int i = 0; i < labelPairs.length; i += 2) {
            want.put(labelPairs[i], labelPairs[i + 1]);
        }
        return samples.stream().filter(s -> s.name().equals(name) && s.labels().equals(want)).mapToDouble(Sample::value)
                .findFirst().orElse(0);
    }

    public List<Sample> samples(String name) {
        return samples.stream().filter(s -> s.name().equals(name)).toList();
    }
}
