package org.loopstand.app.replay;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.Set;

/**
 * The first place where the replayed journal parts from the recorded one.
 *
 * @param index    1-based entry number (header not counted)
 * @param line     line of the recorded file (the header is line 1)
 * @param tMs      the recorded entry's time, epoch ms
 * @param kind     the recorded entry's kind
 * @param field    path of the first field that differs ({@code areas[0].aceMw}), or {@code (entry)} when one side has no entry
 * @param recorded the recorded value as JSON text, {@code (none)} when absent
 * @param replayed the replayed value as JSON text, {@code (none)} when absent
 */
public record Divergence(long index, long line, long tMs, String kind, String field, String recorded, String replayed) {
    static final String NONE = "(none)";
    static final String WHOLE_ENTRY = "(entry)";

    /** A differing field: its path and both sides' values (null when a side lacks it). */
    record Found(String path, JsonNode recorded, JsonNode replayed) {
        String recordedText() {
            return text(recorded);
        }

        String replayedText() {
            return text(replayed);
        }

        private static String text(JsonNode n) {
            return n == null ? NONE : n.toString();
        }
    }

    /**
     * @return the first field, in the recorded entry's order (then the fields only the replayed entry has),
     *         where {@code recorded} and {@code replayed} differ; null when they are equal
     */
    static Found firstDifference(String path, JsonNode recorded, JsonNode replayed) {
        if (recorded == null || replayed == null) {
            return recorded == replayed ? null : new Found(path, recorded, replayed);
        }
        if (recorded.isObject() && replayed.isObject()) {
            Set<String> onlyReplayed = new LinkedHashSet<>();
            replayed.fieldNames().forEachRemaining(onlyReplayed::add);
            for (Iterator<String> it = recorded.fieldNames(); it.hasNext(); ) {
                String name = it.next();
                onlyReplayed.remove(name);
                Found d = firstDifference(join(path, name), recorded.get(name), replayed.get(name));
                if (d != null) {
                    return d;
                }
            }
            return onlyReplayed.isEmpty() ? null : firstDifference(join(path, onlyReplayed.iterator().next()), null,
                    replayed.get(onlyReplayed.iterator().next()));
        }
        if (recorded.isArray() && replayed.isArray()) {
            for (int i = 0; i < Math.max(recorded.size(), replayed.size()); i++) {
                Found d = firstDifference(path + "[" + i + "]", recorded.get(i), replayed.get(i));
                if (d != null) {
                    return d;
                }
            }
            return null;
        }
        return recorded.equals(replayed) ? null : new Found(path, recorded, replayed);
    }

    private static String join(String path, String name) {
        return path.isEmpty() ? name : path + "." + name;
    }

    /** @return the divergence as the command prints it */
    public String describe() {
        return "entry " + index + " (line " + line + ", t=" + tMs + ", " + kind + "): " + field + ": recorded " + recorded
                + ", replayed " + replayed;
    }
}
