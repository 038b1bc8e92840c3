package org.loopstand.app.campaign;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

import org.loopstand.plant.check.CheckOutcome;

/**
 * What a campaign's runs say together: pass rate per check, failure rate of each check among the runs
 * that drew each fault kind, and the same per range of each drawn number (window start and length, and
 * each numeric parameter), in {@link #BINS} equal bins over the values drawn.
 */
public final class CampaignStats {
    /** Bins per drawn number. */
    static final int BINS = 3;

    /** @param runs runs whose checks were decided (errors left out); @param passed of them */
    public record CheckRate(String check, int runs, int passed) {
        public double passRate() {
            return runs == 0 ? Double.NaN : (double) passed / runs;
        }
    }

    /**
     * @param kind         a fault kind, or a load event type
     * @param runs         runs (errors left out) that drew it at least once
     * @param failingRuns  of them, runs where some check failed
     * @param failsByCheck of them, runs where each check failed
     */
    public record KindRow(String kind, int runs, int failingRuns, Map<String, Integer> failsByCheck) {
    }

    /**
     * @param kind         fault kind
     * @param parameter    startS, durationS or a parameter name
     * @param fromValue    bin start (included)
     * @param toValue      bin end (included for the last bin)
     * @param faults       faults of this kind drawn with the value in the bin
     * @param inFailing    of them, faults in runs where some check failed
     * @param failsByCheck of them, by failing check
     */
    public record RangeRow(String kind, String parameter, double fromValue, double toValue, int faults, int inFailing,
                           Map<String, Integer> failsByCheck) {
    }

    private final List<String> checks = new ArrayList<>();
    private final List<CheckRate> checkRates = new ArrayList<>();
    private final List<KindRow> kinds = new ArrayList<>();
    private final List<RangeRow> ranges = new ArrayList<>();

    public CampaignStats(List<RunResult> all) {
        List<RunResult> decided = all.stream().filter(r -> r.status() != RunResult.Status.ERROR).toList();
        Set<String> names = new LinkedHashSet<>();
        decided.forEach(r -> r.checks().forEach(c -> names.add(c.name())));
        checks.addAll(names);
        for (String name : checks) {
            int runs = 0;
            int passed = 0;
            for (RunResult r : decided) {
                for (CheckOutcome c : r.checks()) {
                    if (c.name().equals(name)) {
                        runs++;
                        passed += c.passed() ? 1 : 0;
                    }
                }
            }
            checkRates.add(new CheckRate(name, runs, passed));
        }
        Map<String, List<RunResult>> byKind = new TreeMap<>();
        for (RunResult r : decided) {
            Set<String> drawn = new LinkedHashSet<>();
            r.plan().faults().forEach(f -> drawn.add(f.type()));
            r.plan().loads().forEach(l -> drawn.add(l.type()));
            drawn.forEach(k -> byKind.computeIfAbsent(k, x -> new ArrayList<>()).add(r));
        }
        byKind.forEach((k, runs) -> kinds.add(new KindRow(k, runs.size(),
                (int) runs.stream().filter(r -> r.status() == RunResult.Status.FAIL).count(), failsByCheck(runs))));
        ranges(decided);
    }

    private Map<String, Integer> failsByCheck(List<RunResult> runs) {
        Map<String, Integer> out = new LinkedHashMap<>();
        for (String c : checks) {
            out.put(c, (int) runs.stream().filter(r -> r.failingChecks().contains(c)).count());
        }
        return out;
    }

    private record Drawn(String kind, String parameter, double value, RunResult run) {
    }

    private void ranges(List<RunResult> decided) {
        Map<String, Map<String, List<Drawn>>> byKind = new TreeMap<>();
        for (RunResult r : decided) {
            for (RunPlan.PlannedFault f : r.plan().faults()) {
                Map<String, List<Drawn>> params = byKind.computeIfAbsent(f.type(), x -> new LinkedHashMap<>());
                params.computeIfAbsent("startS", x -> new ArrayList<>()).add(new Drawn(f.type(), "startS", f.startS(), r));
                params.computeIfAbsent("durationS", x -> new ArrayList<>()).add(new Drawn(f.type(), "durationS", f.lengthS(), r));
                new TreeMap<>(f.parameters()).forEach((name, v) -> {
                    if (v instanceof Double d) {
                        params.computeIfAbsent(name, x -> new ArrayList<>()).add(new Drawn(f.type(), name, d, r));
                    }
                });
            }
        }
        byKind.values().forEach(params -> params.values().forEach(this::bin));
    }

    private void bin(List<Drawn> values) {
        double lo = values.stream().mapToDouble(Drawn::value).min().orElse(0);
        double hi = values.stream().mapToDouble(Drawn::value).max().orElse(0);
        int bins = hi > lo ? BINS : 1;
        double width = (hi - lo) / bins;
        for (int b = 0; b < bins; b++) {
            double from = lo + b * width;
            double to = b == bins - 1 ? hi : lo + (b + 1) * width;
            int bin = b;
            List<RunResult> runs = values.stream().filter(d -> binOf(d.value(), lo, width, bins) == bin).map(Drawn::run).toList();
            if (runs.isEmpty()) {
                continue;
            }
            Drawn first = values.get(0);
            ranges.add(new RangeRow(first.kind(), first.parameter(), from, to, runs.size(),
                    (int) runs.stream().filter(r -> r.status() == RunResult.Status.FAIL).count(), failsByCheck(runs)));
        }
    }

    private static int binOf(double v, double lo, double width, int bins) {
        return width <= 0 ? 0 : Math.min(bins - 1, (int) Math.floor((v - lo) / width));
    }

    public List<String> checks() {
        return checks;
    }

    public List<CheckRate> checkRates() {
        return checkRates;
    }

    public List<KindRow> kinds() {
        return kinds;
    }

    public List<RangeRow> ranges() {
        return ranges;
    }
}
