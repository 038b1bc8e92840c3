package org.loopstand.protocol.metrics;

import java.util.HashSet;
import java.util.Locale;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Writes the Prometheus text exposition format (version 0.0.4): one {@code # HELP} and one
 * {@code # TYPE} line per family, then its samples. Written by hand because the format is a few
 * lines of rules and a metrics library would be a second registry beside the counters the rig keeps
 * anyway. Names must match {@code [a-zA-Z_:][a-zA-Z0-9_:]*}; label values are escaped. Not thread-safe:
 * one page per instance.
 */
public final class PrometheusText {
    /** Content type of a page in this format. */
    public static final String CONTENT_TYPE = "text/plain; version=0.0.4; charset=utf-8";
    private static final Pattern NAME = Pattern.compile("[a-zA-Z_:][a-zA-Z0-9_:]*");
    private static final Pattern LABEL = Pattern.compile("[a-zA-Z_][a-zA-Z0-9_]*");

    private final StringBuilder out = new StringBuilder(4096);
    private final Set<String> families = new HashSet<>();
    private String current;

    /** Starts a counter family (its samples only ever grow); the name should end in {@code _total}. */
    public PrometheusText counter(String name, String help) {
        return family(name, "counter", help);
    }

    /** Starts a gauge family (a value that goes up and down). */
    public PrometheusText gauge(String name, String help) {
        return family(name, "gauge", help);
    }

    /** Starts a summary family: samples with a {@code quantile} label, then {@code _sum} and {@code _count}. */
    public PrometheusText summary(String name, String help) {
        return family(name, "summary", help);
    }

    private PrometheusText family(String name, String type, String help) {
        if (!NAME.matcher(name).matches()) {
            throw new IllegalArgumentException("metric name '" + name + "' is not a valid Prometheus name");
        }
        if (!families.add(name)) {
            throw new IllegalArgumentException("metric family '" + name + "' is written twice");
        }
        current = name;
        out.append("# HELP ").append(name).append(' ').append(help.replace("\\", "\\\\").replace("\n", "\\n")).append('\n');
        out.append("# TYPE ").append(name).append(' ').append(type).append('\n');
        return this;
    }

    /**
     * One sample of the current family.
     *
     * @param suffix      "" or a suffix of the family name ({@code _sum}, {@code _count})
     * @param labelPairs  label name, value, name, value, …
     */
    public PrometheusText sample(String suffix, double value, String... labelPairs) {
        if (current == null) {
            throw new IllegalStateException("a sample needs a family first");
        }
        if (labelPairs.length % 2 != 0) {
            throw new IllegalArgumentException("labels come in name/value pairs, got " + labelPairs.length + " strings");
        }
        out.append(current).append(suffix);
        if (labelPairs.length > 0) {
            out.append('{');
            for (int i = 0; i < labelPairs.length; i += 2) {
                if (!LABEL.matcher(labelPairs[i]).matches()) {
                    throw new IllegalArgumentException("label name '" + labelPairs[i] + "' is not valid");
                }
                out.append(i == 0 ? "" : ",").append(labelPairs[i]).append("=\"").append(escape(labelPairs[i + 1])).append('"');
            }
            out.append('}');
        }
        out.append(' ').append(number(value)).append('\n');
        return this;
    }

    /** One sample of the current family without suffix. */
    public PrometheusText sample(double value, String... labelPairs) {
        return sample("", value, labelPairs);
    }

    /**
     * A whole summary family in seconds from a histogram of microseconds: quantiles 0.5, 0.99 and 1
     * (the maximum), then {@code _sum} and {@code _count}.
     */
    public PrometheusText summaryOfMicros(String name, String help, org.HdrHistogram.Histogram us) {
        summary(name, help);
        for (double q : new double[] {0.5, 0.99, 1.0}) {
            sample(us.getValueAtPercentile(q * 100) / 1e6, "quantile", Double.toString(q));
        }
        return sample("_sum", us.getMean() * us.getTotalCount() / 1e6).sample("_count", us.getTotalCount());
    }

    public String text() {
        return out.toString();
    }

    static String escape(String v) {
        return (v == null ? "" : v).replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n");
    }

    static String number(double v) {
        if (Double.isNaN(v)) {
            return "NaN";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "+Inf" : "-Inf";
        }
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : String.format(Locale.ROOT, "%s", v);
    }
}
