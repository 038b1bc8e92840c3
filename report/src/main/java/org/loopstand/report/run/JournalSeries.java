package org.loopstand.report.run;

import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;
import java.util.function.Predicate;

import com.fasterxml.jackson.databind.JsonNode;
import org.loopstand.protocol.journal.JournalEntry;
import org.loopstand.report.model.TimeSeries;

/** Pulls time series out of journal entries by JSON paths (entries are in time order per journal). */
final class JournalSeries {
    private JournalSeries() {
    }

    /** @return entries of one kind */
    static List<JournalEntry> ofKind(List<JournalEntry> entries, String kind) {
        return entries.stream().filter(e -> e.kind().equals(kind)).toList();
    }

    /**
     * @param value  the number from an entry, or NaN / null to skip it
     * @return the series of the picked values
     */
    static TimeSeries series(List<JournalEntry> entries, Predicate<JournalEntry> filter, Function<JournalEntry, Double> value,
            String name, String unit) {
        List<Long> t = new ArrayList<>();
        List<Double> v = new ArrayList<>();
        long last = Long.MIN_VALUE;
        for (JournalEntry e : entries) {
            if (!filter.test(e)) {
                continue;
            }
            Double x = value.apply(e);
            if (x == null || x.isNaN() || e.tMs() < last) {
                continue; // a time that goes backwards (clock re-anchored) is dropped, not reordered
            }
            last = e.tMs();
            t.add(e.tMs());
            v.add(x);
        }
        long[] ta = new long[t.size()];
        double[] va = new double[v.size()];
        for (int i = 0; i < ta.length; i++) {
            ta[i] = t.get(i);
            va[i] = v.get(i);
        }
        return new TimeSeries(name, unit, ta, va);
    }

    /** @return the number at {@code path} (e.g. {@code areas/north/frequencyHz}), or null */
    static Double number(JsonNode node, String path) {
        JsonNode n = node;
        for (String p : path.split("/")) {
            n = n == null ? null : n.get(p);
        }
        return n != null && n.isNumber() ? n.asDouble() : null;
    }

    /** @return the field names of the object at {@code path} over all entries, in first-seen order */
    static Set<String> keys(List<JournalEntry> entries, String path) {
        Set<String> out = new LinkedHashSet<>();
        for (JournalEntry e : entries) {
            JsonNode n = e.fields().get(path);
            if (n != null && n.isObject()) {
                for (Iterator<String> it = n.fieldNames(); it.hasNext(); ) {
                    out.add(it.next());
                }
            }
        }
        return out;
    }

    /** @return the element of array {@code field} whose {@code key} equals {@code value}, or null */
    static JsonNode element(JournalEntry e, String field, String key, String value) {
        JsonNode arr = e.fields().get(field);
        if (arr == null || !arr.isArray()) {
            return null;
        }
        for (JsonNode n : arr) {
            if (value.equals(n.path(key).asText(null))) {
                return n;
            }
        }
        return null;
    }

    /** @return count of each text value, insertion order */
    static Map<String, Long> count(List<String> values) {
        Map<String, Long> m = new LinkedHashMap<>();
        values.forEach(v -> m.merge(v, 1L, Long::sum));
        return m;
    }
}
