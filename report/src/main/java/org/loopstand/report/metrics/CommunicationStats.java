package org.loopstand.report.metrics;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * Communication figures of one side of a run: message rates, loss by sequence gaps, age of data at
 * use, end-to-end command latency, refusals and suspensions by reason.
 *
 * <p>Loss per stream (one publisher's messages of one kind): expected = last seq − first seq + 1,
 * received = distinct seqs, lost = expected − received. Messages lost before the first or after the
 * last received one cannot be seen. A seq lower than the highest seen and not seen before counts as
 * out of order; a seq seen before counts as a duplicate. Percentiles are nearest-rank.
 *
 * @param durationS          time the figures cover, s
 * @param ratesPerS          messages received per second, by kind
 * @param streams            loss figures per stream
 * @param ageAtUseMs         percentiles of data age when the controller used it, ms
 * @param commandLatencyMs   percentiles of command latency end to end (issued → acknowledged), ms
 * @param refusalsByReason   command refusals, by reason, descending count
 * @param suspensionsByReason control suspensions, by reason, descending count
 */
public record CommunicationStats(double durationS, Map<String, Double> ratesPerS, List<StreamLoss> streams,
        Spread ageAtUseMs, Spread commandLatencyMs, Map<String, Long> refusalsByReason,
        Map<String, Long> suspensionsByReason) {

    /**
     * One message as received.
     *
     * @param kind   message kind, e.g. {@code areaMeter}
     * @param source the publisher, e.g. area/meter id
     * @param seq    the message's seq
     */
    public record Received(String kind, String source, long seq) {
    }

    /**
     * Loss of one stream.
     *
     * @param lossPct lost / expected, %
     */
    public record StreamLoss(String kind, String source, long firstSeq, long lastSeq, long expected, long received,
            long lost, long duplicates, long outOfOrder, double lossPct) {
    }

    /**
     * Spread of a set of values (NaN when empty).
     *
     * @param count number of values
     */
    public record Spread(int count, double p50, double p90, double p99, double max) {
        static Spread of(double[] v) {
            double max = Double.NaN;
            for (double x : v) {
                max = Double.isNaN(max) ? x : Math.max(max, x);
            }
            return new Spread(v.length, Percentiles.nearestRank(v, 50), Percentiles.nearestRank(v, 90),
                    Percentiles.nearestRank(v, 99), max);
        }
    }

    /**
     * @param received          messages in arrival order
     * @param ageAtUseMs        age of each value when used, ms
     * @param commandLatencyMs  latency of each acknowledged command, ms
     * @param refusalReasons    reason of each refused command
     * @param suspensionReasons reason of each suspension
     * @param durationS         run duration, s, &gt; 0
     * @return the figures
     */
    public static CommunicationStats of(List<Received> received, double[] ageAtUseMs, double[] commandLatencyMs,
            List<String> refusalReasons, List<String> suspensionReasons, double durationS) {
        if (!(durationS > 0)) {
            throw new IllegalArgumentException("durationS must be positive, got " + durationS);
        }
        Map<String, Long> countsByKind = new TreeMap<>();
        Map<String, List<Long>> byStream = new LinkedHashMap<>();
        for (Received r : received) {
            countsByKind.merge(r.kind(), 1L, Long::sum);
            byStream.computeIfAbsent(r.kind() + "\u0000" + r.source(), k -> new ArrayList<>()).add(r.seq());
        }
        Map<String, Double> rates = new TreeMap<>();
        countsByKind.forEach((k, n) -> rates.put(k, n / durationS));
        List<StreamLoss> streams = new ArrayList<>();
        byStream.forEach((key, seqs) -> streams.add(loss(key.substring(0, key.indexOf('\u0000')),
                key.substring(key.indexOf('\u0000') + 1), seqs)));
        streams.sort((a, b) -> (a.kind() + a.source()).compareTo(b.kind() + b.source()));
        return new CommunicationStats(durationS, rates, List.copyOf(streams), Spread.of(ageAtUseMs),
                Spread.of(commandLatencyMs), countByReason(refusalReasons), countByReason(suspensionReasons));
    }

    private static StreamLoss loss(String kind, String source, List<Long> seqs) {
        Set<Long> seen = new HashSet<>();
        long min = Long.MAX_VALUE;
        long max = Long.MIN_VALUE;
        long duplicates = 0;
        long outOfOrder = 0;
        for (long s : seqs) {
            if (!seen.add(s)) {
                duplicates++;
                continue;
            }
            if (s < max) {
                outOfOrder++;
            }
            min = Math.min(min, s);
            max = Math.max(max, s);
        }
        long expected = max - min + 1;
        long lost = expected - seen.size();
        return new StreamLoss(kind, source, min, max, expected, seen.size(), lost, duplicates, outOfOrder,
                100.0 * lost / expected);
    }

    /** @return counts by reason, highest first, ties by name */
    static Map<String, Long> countByReason(List<String> reasons) {
        Map<String, Long> counts = new TreeMap<>();
        for (String r : reasons) {
            counts.merge(r == null ? "unknown" : r, 1L, Long::sum);
        }
        Map<String, Long> sorted = new LinkedHashMap<>();
        counts.entrySet().stream()
                .sorted((a, b) -> a.getValue().equals(b.getValue()) ? a.getKey().compareTo(b.getKey())
                        : Long.compare(b.getValue(), a.getValue()))
                .forEach(e -> sorted.put(e.getKey(), e.getValue()));
        return sorted;
    }
}
