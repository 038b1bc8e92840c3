package org.loopstand.protocol.bus.memory;

import org.loopstand.protocol.topic.TopicFilter;

/**
 * MQTT topic filter matching for the in-memory broker: {@code +} matches one level, a trailing
 * {@code #} matches the parent level and everything below it; filters starting with a wildcard do not
 * match topics starting with {@code $}. The matching itself is the topic package's.
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

    /** Filter and topic validated beforehand (on subscribe and on publish). */
    static boolean matches(String filter, String topic) {
        return TopicFilter.levelsMatch(filter, topic);
    }
}
