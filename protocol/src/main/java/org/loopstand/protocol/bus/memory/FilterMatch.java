package org.loopstand.protocol.bus.memory;

/**
 * MQTT topic filter matching for the in-memory broker: {@code +} matches one level, a trailing
 * {@code #} matches the parent level and everything below it; filters starting with a wildcard do not
 * match topics starting with {@code $}. Small on purpose; to be unified with the topic package's filter.
 */
final class FilterMatch {
    private FilterMatch() {
    }

    /** @throws IllegalArgumentException when the filter is not a valid MQTT filter */
    static void validate(String filter) {
        if (filter == null || filter.isEmpty()) {
            throw new IllegalArgumentException("topic filter must not be empty");
        }
        String[] levels = filter.split("/", -1);
        for (int i = 0; i < levels.length; i++) {
            String level = levels[i];
            if (level.contains("#") && (!level.equals("#") || i != levels.length - 1)) {
                throw new IllegalArgumentException("'#' must be a whole last level in filter '" + filter + "'");
            }
            if (level.contains("+") && !level.equals("+")) {
                throw new IllegalArgumentException("'+' must be a whole level in filter '" + filter + "'");
            }
        }
    }

    /** @throws IllegalArgumentException when the topic is empty or has wildcards */
    static void validateTopic(String topic) {
        if (topic == null || topic.isEmpty() || topic.contains("+") || topic.contains("#")) {
            throw new IllegalArgumentException("topic must be non-empty without wildcards, got '" + topic + "'");
        }
    }

    static boolean matches(String filter, String topic) {
        if (topic.startsWith("$") && (filter.startsWith("+") || filter.startsWith("#"))) {
            return false;
        }
        String[] f = filter.split("/", -1);
        String[] t = topic.split("/", -1);
        for (int i = 0; i < f.length; i++) {
            if (f[i].equals("#")) {
                return true; // also matches the parent level: "a/#" matches "a"
            }
            if (i >= t.length) {
                return false;
            }
            if (!f[i].equals("+") && !f[i].equals(t[i])) {
                return false;
            }
        }
        return f.length == t.length;
    }
}
